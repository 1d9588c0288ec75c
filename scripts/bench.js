// npm run bench: runs every bench/*.bench.ts in turn (each prints its figures, the floor it measured in
// the same run, the ratio and the target). `npm run bench -- physics` runs the ones whose name matches.
import { readdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';

const filter = process.argv[2];
const files = readdirSync('bench')
	.filter((f) => f.endsWith('.bench.ts') && (!filter || f.includes(filter)))
	.sort();
let failed = 0;
for (const f of files) {
	console.log(`\n=== bench/${f} ===`);
	const r = spawnSync('node_modules/.bin/tsx', [`bench/${f}`], { stdio: 'inherit', env: process.env });
	if (r.status !== 0) {
		failed++;
		console.log(`bench/${f} exited with ${r.status}`);
	}
}
if (files.length === 0) console.log('no benchmarks matched');
process.exit(failed ? 1 : 0);
