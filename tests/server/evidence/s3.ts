// The evidence suites' own S3 bucket: s3rver on a free loopback port with a temporary directory, the
// S3_* settings pointed at it (before the evidence service is imported), and small helpers to look into
// the bucket and to build uploads as a browser sends them.
import { createRequire } from 'node:module';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';

type S3rverServer = {
	run(): Promise<{ port: number }>;
	close(): Promise<void>;
};
type S3rverClass = new (options: Record<string, unknown>) => S3rverServer;
// s3rver ships no type declarations.
const S3rver = createRequire(import.meta.url)('s3rver') as S3rverClass;

export const BUCKET = 'evidence-test';
const SETTINGS = [
	'S3_ENDPOINT',
	'S3_REGION',
	'S3_BUCKET',
	'S3_ACCESS_KEY_ID',
	'S3_SECRET_ACCESS_KEY',
	'S3_FORCE_PATH_STYLE'
];

/** Start the fake bucket and point the S3_* settings at it; `stop` ends it and removes its files. */
export async function startFakeS3() {
	const dir = mkdtempSync(join(tmpdir(), 'envelo-s3-test-'));
	const server = new S3rver({
		address: '127.0.0.1',
		port: 0,
		directory: dir,
		silent: true,
		configureBuckets: [{ name: BUCKET, configs: [] }]
	});
	const { port } = await server.run();
	const endpoint = `http://127.0.0.1:${port}`;
	const before = Object.fromEntries(SETTINGS.map((k) => [k, process.env[k]]));
	Object.assign(process.env, {
		S3_ENDPOINT: endpoint,
		S3_REGION: 'us-east-1',
		S3_BUCKET: BUCKET,
		S3_ACCESS_KEY_ID: 'S3RVER',
		S3_SECRET_ACCESS_KEY: 'S3RVER',
		S3_FORCE_PATH_STYLE: 'true'
	});
	const client = new S3Client({
		endpoint,
		region: 'us-east-1',
		forcePathStyle: true,
		credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' }
	});
	return {
		endpoint,
		/** Every key in the bucket under a prefix. */
		async keys(prefix = ''): Promise<string[]> {
			const out = await client.send(new ListObjectsV2Command({ Bucket: BUCKET, Prefix: prefix }));
			return (out.Contents ?? []).map((o) => o.Key!).sort();
		},
		async stop() {
			client.destroy();
			await server.close();
			rmSync(dir, { recursive: true, force: true });
			for (const [k, v] of Object.entries(before)) {
				if (v === undefined) delete process.env[k];
				else process.env[k] = v;
			}
		}
	};
}

/** A loopback port nothing listens on (found free, then closed again). */
export async function closedPort(): Promise<number> {
	return new Promise((resolve) => {
		const s = createServer();
		s.listen(0, '127.0.0.1', () => {
			const { port } = s.address() as { port: number };
			s.close(() => resolve(port));
		});
	});
}

/**
 * A multipart request as a browser sends the upload form: the fields in order, then the file.
 * `headers` adds or overrides request headers.
 */
export function multipart(
	url: string,
	fields: [string, string][],
	file: { name: string; bytes: Uint8Array; type?: string } | null,
	headers: Record<string, string> = {}
): Request {
	const fd = new FormData();
	for (const [k, v] of fields) fd.append(k, v);
	if (file) {
		const blob = new Blob([file.bytes as Uint8Array<ArrayBuffer>], {
			type: file.type ?? 'application/octet-stream'
		});
		fd.append('file', blob, file.name);
	}
	const probe = new Request(url, { method: 'POST', body: fd });
	const h = new Headers(probe.headers);
	for (const [k, v] of Object.entries(headers)) h.set(k, v);
	return new Request(url, { method: 'POST', body: probe.body, headers: h, duplex: 'half' } as RequestInit);
}
