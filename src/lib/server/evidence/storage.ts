/**
 * Where evidence files are kept: any bucket that speaks the S3 API, set up from the environment, so a
 * real bucket is a change of settings. Locally and in tests it is `scripts/fake-s3.js` (s3rver).
 *
 *   S3_BUCKET             the bucket (required; without it evidence cannot be stored and says so)
 *   S3_REGION             its region (default us-east-1)
 *   S3_ENDPOINT           the API's address, e.g. http://127.0.0.1:4569; unset for AWS itself
 *   S3_ACCESS_KEY_ID      with S3_SECRET_ACCESS_KEY; unset to use the SDK's default credential chain
 *   S3_SECRET_ACCESS_KEY
 *   S3_FORCE_PATH_STYLE   true for http://host/bucket/key (fakes, most self-hosted stores)
 *
 * Keys are made by the evidence service and carry the organisation and dwelling; nothing here decides
 * who may read an object (the routes that proxy it do).
 */
import type { Readable } from 'node:stream';
import {
	DeleteObjectCommand,
	GetObjectCommand,
	PutObjectCommand,
	S3Client,
	S3ServiceException
} from '@aws-sdk/client-s3';
import { setting } from '$lib/server/config';
import { UnavailableError } from '$lib/server/errors';

export type StorageConfig = {
	bucket: string;
	region: string;
	endpoint: string | null;
	credentials: { accessKeyId: string; secretAccessKey: string } | null;
	forcePathStyle: boolean;
};

const NOT_CONFIGURED =
	'Evidence cannot be stored: no file store is configured (S3_BUCKET and, for anything but AWS, S3_ENDPOINT).';
const UNREACHABLE =
	'The file store for evidence cannot be reached just now; nothing was saved. Try again in a few seconds.';

/** The store's settings as the environment gives them now; a 503 that says so when there is no bucket. */
export function storageConfig(): StorageConfig {
	const bucket = setting('S3_BUCKET')?.trim();
	if (!bucket) throw new UnavailableError(NOT_CONFIGURED);
	const accessKeyId = setting('S3_ACCESS_KEY_ID');
	const secretAccessKey = setting('S3_SECRET_ACCESS_KEY');
	return {
		bucket,
		region: setting('S3_REGION')?.trim() || 'us-east-1',
		endpoint: setting('S3_ENDPOINT')?.trim() || null,
		credentials: accessKeyId && secretAccessKey ? { accessKeyId, secretAccessKey } : null,
		forcePathStyle: /^(1|true|yes)$/i.test(setting('S3_FORCE_PATH_STYLE') ?? '')
	};
}

/**
 * One client for the settings in force (its sockets are reused); a change of settings makes a new one.
 * Losing it costs only a new connection.
 */
let current: { key: string; client: S3Client } | null = null;

function clientFor(config: StorageConfig): S3Client {
	const key = JSON.stringify(config);
	if (current?.key === key) return current.client;
	current?.client.destroy();
	const client = new S3Client({
		region: config.region,
		...(config.endpoint ? { endpoint: config.endpoint } : {}),
		...(config.credentials ? { credentials: config.credentials } : {}),
		forcePathStyle: config.forcePathStyle,
		// Checksums only where the API requires them: some S3-compatible stores refuse the CRC32 headers
		// the SDK now sends by default. Integrity is kept by ChecksumSHA256 on every put.
		requestChecksumCalculation: 'WHEN_REQUIRED',
		responseChecksumValidation: 'WHEN_REQUIRED',
		requestHandler: { connectionTimeout: 5000, requestTimeout: 120_000 }
	});
	current = { key, client };
	return client;
}

/** An answer of the store (an S3 error with a status) rather than a network failure. */
function fromStore(e: unknown): e is S3ServiceException {
	return e instanceof S3ServiceException && typeof e.$metadata?.httpStatusCode === 'number';
}

/** A network failure as the 503 it is; a refusal of the store (credentials, bucket) stays a fault. */
function storeError(e: unknown, what: string): unknown {
	if (fromStore(e)) {
		return new Error(`The file store refused to ${what}: ${e.name} (${e.$metadata.httpStatusCode})`, {
			cause: e
		});
	}
	return new UnavailableError(UNREACHABLE);
}

/**
 * Store an object. `sha256` (hex) is sent as the object's SHA-256 checksum, which a real bucket checks
 * against the bytes it received.
 */
export async function putObject(
	key: string,
	body: Readable | Uint8Array,
	meta: { contentType: string; bytes: number; sha256: string }
): Promise<void> {
	const config = storageConfig();
	try {
		await clientFor(config).send(
			new PutObjectCommand({
				Bucket: config.bucket,
				Key: key,
				Body: body,
				ContentLength: meta.bytes,
				ContentType: meta.contentType,
				ChecksumSHA256: Buffer.from(meta.sha256, 'hex').toString('base64'),
				Metadata: { sha256: meta.sha256 }
			})
		);
	} catch (e) {
		throw storeError(e, 'store the file');
	}
}

export type StoredObject = { body: ReadableStream<Uint8Array>; bytes: number | null };

/** An object's bytes as a stream, or null when the store has no such key. */
export async function getObject(key: string): Promise<StoredObject | null> {
	const config = storageConfig();
	try {
		const out = await clientFor(config).send(new GetObjectCommand({ Bucket: config.bucket, Key: key }));
		if (!out.Body) return null;
		return {
			body: out.Body.transformToWebStream() as ReadableStream<Uint8Array>,
			bytes: out.ContentLength ?? null
		};
	} catch (e) {
		if (fromStore(e) && (e.name === 'NoSuchKey' || e.$metadata.httpStatusCode === 404)) return null;
		throw storeError(e, 'read the file');
	}
}

/** Remove an object; removing one that is not there is not an error (S3 answers 204 either way). */
export async function deleteObject(key: string): Promise<void> {
	const config = storageConfig();
	try {
		await clientFor(config).send(new DeleteObjectCommand({ Bucket: config.bucket, Key: key }));
	} catch (e) {
		throw storeError(e, 'delete the file');
	}
}

/**
 * Remove objects whose row was never written or has gone, as far as the store lets us now: a failure is
 * logged and leaves an object no row points at (invisible, since files are only served through a row),
 * never a row without its object.
 */
export async function deleteObjectsQuietly(keys: (string | null)[]): Promise<void> {
	for (const key of keys) {
		if (!key) continue;
		await deleteObject(key).catch((e: unknown) =>
			console.error(`[evidence] could not delete the object ${key}: ${(e as Error).message}`)
		);
	}
}
