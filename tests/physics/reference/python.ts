// Runs an independent Python/numpy reference script of this folder: JSON in on standard input,
// JSON out. Suites skip themselves (with the reason in their title) when python3 or numpy is missing.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

/** The first Python with numpy: the one on the PATH, else Debian's (where the test command installs numpy). */
const PYTHON =
	['python3', '/usr/bin/python3'].find(
		(p) => spawnSync(p, ['-c', 'import numpy'], { encoding: 'utf8' }).status === 0
	) ?? 'python3';
const probe = spawnSync(PYTHON, ['-c', 'import numpy; print(numpy.__version__)'], { encoding: 'utf8' });

/** numpy's version, or null when python3 with numpy is not available. */
export const numpyVersion: string | null = probe.status === 0 ? probe.stdout.trim() : null;

/** The title part that says which reference ran, or why it was skipped. */
export const referenceTitle = numpyVersion
	? `numpy ${numpyVersion}`
	: 'python3 with numpy not found: skipped';

/** Run `script` (a file name in this folder) on `input`; its parsed JSON output. */
export function runReference<T>(script: string, input: unknown): T {
	const path = fileURLToPath(new URL(`./${script}`, import.meta.url));
	const out = spawnSync(PYTHON, [path], {
		input: JSON.stringify(input),
		encoding: 'utf8',
		timeout: 60000
	});
	if (out.status !== 0) throw new Error(`${script} failed: ${out.stderr}`);
	return JSON.parse(out.stdout) as T;
}
