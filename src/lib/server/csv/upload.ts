/**
 * An upload read as it arrives: multipart/form-data through busboy, or a bare text/csv body. The file
 * is handed on as a stream of chunks while the request is still coming in, so a large file is never
 * held whole. Form fields must come before the file part to be seen in time; the page sends them so,
 * and API callers may put them in the query string instead.
 */
import { Readable } from 'node:stream';
import type { ReadableStream as NodeWebStream } from 'node:stream/web';
import busboy from 'busboy';

export class UploadError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'UploadError';
	}
}

export type Upload = {
	/** form fields that came before the file, then the query string for any not given */
	fields: Map<string, string>;
	file: { name: string; chunks: AsyncIterable<Uint8Array> } | null;
	/** fields that came after the file part (too late to act on) */
	lateFields: () => string[];
	/** read what is left of the request and wait for its end; call once the file is dealt with */
	finish: () => Promise<void>;
};

const CSV_TYPES = ['text/csv', 'text/plain', 'application/csv', 'application/octet-stream'];

export async function readUpload(request: Request, url: URL, fileField = 'file'): Promise<Upload> {
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	const fromQuery = (fields: Map<string, string>) => {
		for (const [k, v] of url.searchParams) if (!fields.has(k)) fields.set(k, v);
		return fields;
	};
	if (!request.body) throw new UploadError('The request has no body: send the CSV file.');
	const body = Readable.fromWeb(request.body as unknown as NodeWebStream<Uint8Array>);

	if (CSV_TYPES.some((t) => type.startsWith(t))) {
		const name = url.searchParams.get('name') ?? 'upload.csv';
		return {
			fields: fromQuery(new Map()),
			file: { name, chunks: body.iterator({ destroyOnReturn: false }) },
			lateFields: () => [],
			finish: async () => {
				body.resume();
				if (!body.readableEnded) await new Promise<void>((r) => body.once('close', r).once('end', r));
			}
		};
	}
	if (!type.startsWith('multipart/form-data')) {
		body.resume();
		throw new UploadError(
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
		body.resume();
		throw new UploadError('The upload could not be read (a malformed multipart request); try again.');
	}
	const fields = new Map<string, string>();
	const late: string[] = [];
	let fileSeen = false;
	let fileStream: Readable | null = null;
	let failed: Error | null = null;
	const closed = new Promise<void>((resolve) => {
		bb.once('close', resolve);
		bb.once('error', (e: Error) => {
			failed = e;
			body.unpipe(bb);
			body.resume();
			resolve();
		});
	});
	const upload = new Promise<Upload>((resolve, reject) => {
		const finish = async () => {
			fileStream?.resume(); // whatever of the file was not read (a kept preview, a refused file)
			await closed;
		};
		bb.on('field', (name: string, value: string) => {
			if (fileSeen) late.push(name);
			else fields.set(name, value);
		});
		bb.on('file', (name: string, stream: Readable, info: { filename: string }) => {
			if (name !== fileField || fileSeen) {
				stream.resume();
				return;
			}
			fileSeen = true;
			fileStream = stream;
			resolve({
				fields: fromQuery(fields),
				file: {
					name: info.filename || 'upload.csv',
					chunks: {
						[Symbol.asyncIterator]: () => {
							const it = stream.iterator({ destroyOnReturn: false });
							return {
								next: async () => {
									try {
										return await it.next();
									} catch {
										throw new UploadError('The upload was cut off before the file ended; try again.');
									}
								},
								// Stopped early (a bad file): drain the rest so the request still ends.
								return: async (v?: unknown) => {
									await it.return?.(); // detaches the iterator without destroying the stream
									stream.resume();
									return { done: true as const, value: v as Uint8Array };
								}
							};
						}
					}
				},
				lateFields: () => late,
				finish
			});
		});
		closed.then(() => {
			if (failed)
				reject(
					new UploadError('The upload could not be read (the request was cut off or malformed); try again.')
				);
			else resolve({ fields: fromQuery(fields), file: null, lateFields: () => late, finish });
		});
	});
	body.pipe(bb);
	return upload;
}
