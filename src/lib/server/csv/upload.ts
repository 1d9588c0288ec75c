/**
 * An upload read as it arrives: multipart/form-data through busboy, or a bare text/csv body. The file
 * is handed on as a stream of chunks while the request is still coming in, so a large file is never
 * held whole. Form fields must come before the file part to be seen in time; the page sends them so,
 * and API callers may put them in the query string instead. A request that breaks off (the client
 * went away, the server's body limit) ends the file with a ValidationError, never an unhandled error.
 */
import { Readable } from 'node:stream';
import { finished } from 'node:stream/promises';
import type { ReadableStream as NodeWebStream } from 'node:stream/web';
import busboy from 'busboy';
import { ValidationError } from '$lib/server/errors';

/** A request whose upload cannot be read (400), e.g. one that was cut off. */
const uploadError = (message: string) => new ValidationError([{ path: '(upload)', message }], message);

export type Upload = {
	/** form fields that came before the file, then the query string for any not given */
	fields: Map<string, string>;
	file: { name: string; chunks: AsyncIterable<Uint8Array> } | null;
	/** fields that came after the file part (too late to act on); complete once `finish` has settled */
	lateFields: () => string[];
	/** read what is left of the request and wait for its end; call once the file is dealt with */
	finish: () => Promise<void>;
};

const CSV_TYPES = ['text/csv', 'text/plain', 'application/csv', 'application/octet-stream'];

const CUT_OFF = 'The upload was cut off before the file ended; try again.';

/**
 * The chunks of a stream, for a reader that may stop early: stopping detaches without destroying, so
 * the rest can still be drained; a stream error becomes a ValidationError.
 */
function chunksOf(stream: Readable): AsyncIterable<Uint8Array> {
	return {
		[Symbol.asyncIterator]: () => {
			const it = stream.iterator({ destroyOnReturn: false });
			return {
				next: async () => {
					try {
						return await it.next();
					} catch {
						throw uploadError(CUT_OFF);
					}
				},
				return: async (v?: unknown) => {
					await it.return?.().catch(() => undefined);
					stream.resume();
					return { done: true as const, value: v as Uint8Array };
				}
			};
		}
	};
}

/** Wait for a stream to end or fail, reading whatever is left; never throws. */
async function drain(stream: Readable): Promise<void> {
	if (stream.destroyed || stream.readableEnded) return;
	stream.resume();
	await finished(stream).catch(() => undefined);
}

export async function readUpload(request: Request, url: URL, fileField = 'file'): Promise<Upload> {
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	const fromQuery = (fields: Map<string, string>) => {
		for (const [k, v] of url.searchParams) if (!fields.has(k)) fields.set(k, v);
		return fields;
	};
	if (!request.body) throw uploadError('The request has no body: send the CSV file.');
	const body = Readable.fromWeb(request.body as unknown as NodeWebStream<Uint8Array>);
	body.on('error', () => undefined); // reported through the reader (a ValidationError), not as a crash

	if (CSV_TYPES.some((t) => type.startsWith(t))) {
		const name = url.searchParams.get('name') ?? 'upload.csv';
		return {
			fields: fromQuery(new Map()),
			file: { name, chunks: chunksOf(body) },
			lateFields: () => [],
			finish: () => drain(body)
		};
	}
	if (!type.startsWith('multipart/form-data')) {
		await drain(body);
		throw uploadError(
			`Send the file as multipart/form-data in a field named "${fileField}", or as the body with Content-Type: text/csv.`
		);
	}

	let bb: busboy.Busboy;
	try {
		bb = busboy({
			headers: { 'content-type': request.headers.get('content-type') ?? '' },
			limits: { fields: 20, fieldSize: 256 * 1024, files: 1, parts: 40 }
		});
	} catch {
		await drain(body);
		throw uploadError('The upload could not be read (a malformed multipart request); try again.');
	}
	const fields = new Map<string, string>();
	const late: string[] = [];
	let fileSeen = false;
	let fileStream: Readable | null = null;
	let failed = false;
	const closed = new Promise<void>((resolve) => {
		bb.once('close', resolve);
		bb.once('error', () => {
			failed = true;
			fileStream?.destroy(new Error('multipart error'));
			body.unpipe(bb);
			void drain(body);
			resolve();
		});
	});
	// A broken request body ends the multipart parser with an error (pipe alone would not pass it on).
	body.once('error', (e) => bb.destroy(e));
	const finish = async () => {
		if (fileStream) void drain(fileStream); // whatever of the file was not read
		await closed;
	};
	const upload = new Promise<Upload>((resolve, reject) => {
		bb.on('field', (name: string, value: string) => {
			if (fileSeen) late.push(name);
			else fields.set(name, value);
		});
		bb.on('file', (name: string, stream: Readable, info: { filename: string }) => {
			stream.on('error', () => undefined);
			if (name !== fileField || fileSeen) {
				stream.resume();
				return;
			}
			fileSeen = true;
			fileStream = stream;
			resolve({
				fields: fromQuery(fields),
				file: { name: info.filename || 'upload.csv', chunks: chunksOf(stream) },
				lateFields: () => late,
				finish
			});
		});
		void closed.then(() => {
			if (failed) reject(uploadError(CUT_OFF));
			else resolve({ fields: fromQuery(fields), file: null, lateFields: () => late, finish });
		});
	});
	body.pipe(bb);
	return upload;
}
