// Writes tests/physics/fixtures/glaser-characterisation.json: the engine's own output for the
// inputs of glaser.characterisation.cases.ts. Run once, from the repository root, on the code the
// fixture is to guard:
//   node_modules/.bin/tsx tests/physics/glaser.characterisation.generate.ts
// It refuses to overwrite an existing fixture unless given --overwrite: a changed result is either
// a regression or a deliberate change of the engine, and the second needs a reviewed new fixture.
import { existsSync, writeFileSync } from 'node:fs';
import { ENGINE_VERSION } from '../../src/lib/physics';
import { CASES, FIXTURE_PATH, runCase } from './glaser.characterisation.cases';

if (existsSync(FIXTURE_PATH) && !process.argv.includes('--overwrite')) {
	console.error(`${FIXTURE_PATH} exists; pass --overwrite to replace it`);
	process.exit(1);
}
const cases: Record<string, unknown> = {};
for (const c of CASES) {
	if (c.name in cases) throw new Error(`duplicate case name: ${c.name}`);
	cases[c.name] = runCase(c);
}
const about =
	'The engine\'s own earlier output for the inputs of glaser.characterisation.cases.ts: a regression guard for refactoring the Glaser cycle, not an outside reference. Numbers as JSON (shortest round-trip form); -0, non-finite numbers, undefined values and array holes as { "$": ... }.';
// One line per case: a change shows as the case it is in.
const lines = Object.entries(cases).map(([name, v]) => `\t\t${JSON.stringify(name)}: ${JSON.stringify(v)}`);
writeFileSync(
	FIXTURE_PATH,
	`{\n\t"about": ${JSON.stringify(about)},\n\t"engineVersion": ${JSON.stringify(ENGINE_VERSION)},\n\t"cases": {\n${lines.join(',\n')}\n\t}\n}\n`
);
console.log(`wrote ${CASES.length} cases to ${FIXTURE_PATH}`);
