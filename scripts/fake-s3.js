// A local stand-in for an S3 bucket: s3rver on 127.0.0.1, keeping objects on disk, with the bucket made
// at start. Never listens beyond loopback. Envelo talks to it as to any S3 API (src/lib/server/evidence).
//   node scripts/fake-s3.js --port 4569 --dir .data/s3 --bucket envelo-evidence
// Credentials: access key S3RVER, secret S3RVER (s3rver's own), path-style addressing.
import S3rver from 's3rver';
import fs from 'node:fs';
import path from 'node:path';

const args = Object.fromEntries(
	process.argv
		.slice(2)
		.reduce((pairs, a, i, all) => (a.startsWith('--') ? [...pairs, [a.slice(2), all[i + 1]]] : pairs), [])
);
const port = Number(args.port ?? 4569);
const dir = path.resolve(args.dir ?? '.data/s3');
const bucket = args.bucket ?? 'envelo-evidence';
fs.mkdirSync(dir, { recursive: true });

const server = new S3rver({
	address: '127.0.0.1',
	port,
	directory: dir,
	silent: true,
	configureBuckets: [{ name: bucket, configs: [] }]
});

try {
	await server.run();
} catch (e) {
	console.error(`[fake-s3] could not start on 127.0.0.1:${port}: ${e.message}`);
	process.exit(1);
}
console.log(
	`[fake-s3] S3 API on http://127.0.0.1:${port}, bucket ${bucket} (key S3RVER, secret S3RVER), storing in ${dir}`
);

const stop = () => {
	server.close(() => process.exit(0));
	setTimeout(() => process.exit(0), 500).unref();
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
