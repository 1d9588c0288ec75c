// The import-direction check (scripts/check-imports.js) on small fake trees written to a temp folder.
// The rules themselves are the project's own (listed at the top of the script). What the parser must
// treat as an import, and what vanishes at build time, follows outside references:
// - ECMAScript module syntax (ECMA-262, "Imports" and "Exports"; import() calls): the forms
//   `import x from`, `import 'x'`, `export … from`, `import('x')`.
// - TypeScript 3.8 release notes, "Type-Only Imports and Exports": `import type` / `export type` are
//   always erased. TypeScript 5.0 release notes, "--verbatimModuleSyntax": `import { type A } from 'a'`
//   is emitted as `import {} from 'a'` (from memory; checked here against ts.transpileModule itself).
// - SvelteKit docs, "$lib" (src/lib alias), "$app/*", "$env/*" modules and the generated "./$types".
// - Svelte 5 docs, "<script module>": a component may carry a module script beside the instance one.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import ts from 'typescript';
import { afterEach, describe, expect, it } from 'vitest';
import {
	checkImports,
	findCircles,
	formatViolation,
	parseImports,
	svelteScripts
} from '../../scripts/check-imports.js';

const SCRIPT = path.resolve('scripts/check-imports.js');
const made: string[] = [];

/** Write a fake project: keys are paths relative to its root. */
function tree(files: Record<string, string>): string {
	const root = fs.mkdtempSync(path.join(os.tmpdir(), 'envelo-imports-'));
	made.push(root);
	fs.mkdirSync(path.join(root, 'src'), { recursive: true });
	for (const [rel, text] of Object.entries(files)) {
		fs.mkdirSync(path.dirname(path.join(root, rel)), { recursive: true });
		fs.writeFileSync(path.join(root, rel), text);
	}
	return root;
}

function run(root: string) {
	const r = spawnSync(process.execPath, [SCRIPT, '--root', root], { encoding: 'utf8' });
	return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The violations as "rule file:line target" strings, for compact assertions. */
function brief(root: string): string[] {
	return checkImports(root).violations.map((v) => `${v.rule} ${v.file}:${v.line} ${v.target}`);
}

afterEach(() => {
	for (const root of made.splice(0)) fs.rmSync(root, { recursive: true, force: true });
});

describe('a clean tree', () => {
	it('passes with exit 0 and a one-line summary counting files and imports', () => {
		const root = tree({
			'src/lib/physics/index.ts': "export * from './series';\n",
			'src/lib/physics/series.ts': "import { z } from 'zod';\nexport const s = z.number();\n",
			'src/lib/format.ts': "import { s } from '$lib/physics';\nexport const f = s;\n",
			'src/lib/server/db.ts': "import knex from 'knex';\nexport const db = knex({});\n",
			'src/lib/server/library/index.ts': "import { db } from '$lib/server/db';\nexport const list = db;\n",
			'src/lib/components/badge.svelte':
				'<script lang="ts">\n\timport { f } from \'$lib/format\';\n</script>\n<p>{f}</p>\n',
			'src/routes/+page.server.ts':
				"import type { PageServerLoad } from './$types';\nimport { list } from '$lib/server/library';\nexport const load: PageServerLoad = () => ({ list });\n",
			'src/routes/+layout.svelte':
				"<script>\n\timport '../app.css';\n\timport { page } from '$app/state';\n</script>\n",
			'src/app.css': 'body {}\n'
		});
		// 8 source files (app.css is not one); imports: 1+1+1+1+1+1+2+2 = 10.
		expect(run(root)).toEqual({
			status: 0,
			stdout: 'import directions: 8 files, 10 imports, 0 violations\n',
			stderr: ''
		});
	});
});

describe('direction rules', () => {
	it('rule 1: physics imports only physics, and nothing from $app, $env or svelte', () => {
		const root = tree({
			'src/lib/format.ts': 'export const f = 1;\n',
			'src/lib/physics/a.ts': [
				"import { b } from './sub/b';", // 1: fine, within physics
				"import { c } from '../physics/c';", // 2: fine, relative inside physics
				"import { f } from '$lib/format';", // 3: outside physics
				"import { g } from '../format';", // 4: outside physics (reported once, as rule 1)
				"import { browser } from '$app/environment';", // 5
				"import { env } from '$env/dynamic/private';", // 6
				"import { writable } from 'svelte/store';", // 7
				"import { z } from 'zod';" // 8: a package is fine
			].join('\n'),
			'src/lib/physics/sub/b.ts': 'export const b = 1;\n',
			'src/lib/physics/c.ts': 'export const c = 1;\n'
		});
		expect(brief(root)).toEqual([
			'1 src/lib/physics/a.ts:3 src/lib/format.ts',
			'1 src/lib/physics/a.ts:4 src/lib/format.ts',
			'1 src/lib/physics/a.ts:5 $app/environment',
			'1 src/lib/physics/a.ts:6 $env/dynamic/private',
			'1 src/lib/physics/a.ts:7 svelte/store'
		]);
	});

	it('rules 2–4: components, server code and shared modules keep to their side', () => {
		const root = tree({
			'src/lib/server/db.ts': 'export const db = 1;\n',
			'src/lib/server/mail.ts':
				"import Chip from '$lib/components/chip.svelte';\nimport { x } from '$lib/shared';\nexport const m = 1;\n",
			'src/lib/components/chip.svelte': '<span></span>\n',
			'src/lib/components/badge.svelte': [
				'<script lang="ts">',
				"\timport { m } from '$lib/server/mail';",
				"\timport type { R } from '$lib/../routes/r';",
				"\timport { x } from '$lib/shared';",
				'</script>'
			].join('\n'),
			'src/lib/shared.ts':
				"import type { Db } from '$lib/server/db';\nimport Chip from '$lib/components/chip.svelte';\nexport const x = 1;\n",
			'src/lib/server/r.ts': "import { r } from '$lib/../routes/r';\n",
			'src/routes/r.ts': 'export const r = 1;\nexport type R = number;\n'
		});
		// Type-only imports count for the directions (line 3 of badge, line 1 of shared).
		expect(brief(root)).toEqual([
			'2 src/lib/components/badge.svelte:2 src/lib/server/mail.ts',
			'2 src/lib/components/badge.svelte:3 src/routes/r.ts',
			'3 src/lib/server/mail.ts:1 src/lib/components/chip.svelte',
			'3 src/lib/server/r.ts:1 src/routes/r.ts',
			'4 src/lib/shared.ts:1 src/lib/server/db.ts',
			'4 src/lib/shared.ts:2 src/lib/components/chip.svelte'
		]);
	});

	it('rule 5: routes call a service, never $lib/server/db', () => {
		const root = tree({
			'src/lib/server/db.ts': 'export const db = 1;\n',
			'src/lib/server/library/index.ts': "import { db } from '../db';\nexport const l = db;\n",
			'src/routes/a/+page.server.ts': "import { db } from '$lib/server/db';\n",
			'src/routes/b/+server.ts': "import { l } from '$lib/server/library';\n",
			'src/routes/c/+server.ts': "import type { Db } from '$lib/server/db.js';\n"
		});
		// library/index.ts's '../db' breaks rule 6, not rule 5.
		expect(brief(root)).toEqual([
			'5 src/routes/a/+page.server.ts:1 src/lib/server/db.ts',
			'5 src/routes/c/+server.ts:1 src/lib/server/db.ts',
			'6 src/lib/server/library/index.ts:1 src/lib/server/db.ts'
		]);
	});

	it('rule 6: ../ across folders is flagged, ./ and assets are not', () => {
		const root = tree({
			'src/app.css': 'body {}\n',
			'src/lib/format.ts': 'export const f = 1;\n',
			'src/lib/dwellings/sub/x.ts': 'export const x = 1;\n',
			'src/lib/dwellings/kinds.ts': [
				"import { x } from './sub/x';", // fine: same folder or below
				"import { f } from '../format';", // flagged
				"import { g } from '$lib/format';" // fine
			].join('\n'),
			'src/routes/+layout.svelte': "<script>\n\timport '../app.css';\n</script>\n",
			'src/routes/api/respond.ts': 'export const r = 1;\n',
			'src/routes/api/items/+server.ts': "import { r } from '../respond';\n",
			// a route's own `_` helpers (SvelteKit: not routes) are fine from beside or below
			'src/routes/t/_u.ts': 'export const u = 1;\n',
			'src/routes/t/_parts/p.svelte': '<p>p</p>\n',
			'src/routes/t/[id]/+page.ts': "import { u } from '../_u';\nimport P from '../_parts/p.svelte';\n"
		});
		expect(brief(root)).toEqual([
			'6 src/lib/dwellings/kinds.ts:2 src/lib/format.ts',
			'6 src/routes/api/items/+server.ts:1 src/routes/api/respond.ts'
		]);
	});
});

describe('rule 7: circles', () => {
	it('reports a value circle once, as a chain starting at its first file', () => {
		const root = tree({
			'src/lib/b.ts': "import { c } from './c';\nexport const b = 1;\n",
			'src/lib/c.ts': "\nimport { a } from './a';\nexport const c = 1;\n",
			'src/lib/a.ts': "import { b } from './b';\nexport const a = 1;\n"
		});
		const r = checkImports(root);
		expect(r.circles).toEqual([['src/lib/a.ts', 'src/lib/b.ts', 'src/lib/c.ts', 'src/lib/a.ts']]);
		expect(r.violations.map(formatViolation)).toEqual([
			'src/lib/a.ts:1  imports  src/lib/b.ts  — rule 7: circle src/lib/a.ts → src/lib/b.ts → src/lib/c.ts → src/lib/a.ts'
		]);
	});

	it('leaves out import type and export type, keeps inline `type` names, re-exports and import()', () => {
		const erased = tree({
			'src/lib/a.ts': "import type { B } from './b';\nexport const a = 1;\n",
			'src/lib/b.ts': "import { a } from './a';\nexport type B = number;\n",
			'src/lib/c.ts': "export type { D } from './d';\nexport const c = 1;\n",
			'src/lib/d.ts': "import { c } from './c';\nexport type D = number;\n",
			'src/lib/e.ts': "export const e = 1;\nexport type E = typeof import('./f').f;\n",
			'src/lib/f.ts': "import { e } from './e';\nexport const f = e;\n"
		});
		expect(checkImports(erased).circles).toEqual([]);

		const kept = tree({
			'src/lib/a.ts': "import { type B } from './b';\nexport const a = 1;\n",
			'src/lib/b.ts': "import { a } from './a';\nexport type B = number;\n",
			'src/lib/c.ts': "export * from './d';\nexport const c = 1;\n",
			'src/lib/d.ts': "import { c } from './c';\n",
			'src/lib/e.ts': "export const load = () => import('./f');\n",
			'src/lib/f.ts': "import './e';\n"
		});
		expect(checkImports(kept).circles).toEqual([
			['src/lib/a.ts', 'src/lib/b.ts', 'src/lib/a.ts'],
			['src/lib/c.ts', 'src/lib/d.ts', 'src/lib/c.ts'],
			['src/lib/e.ts', 'src/lib/f.ts', 'src/lib/e.ts']
		]);
	});

	it('the inline-type rule matches what the TypeScript compiler emits under verbatimModuleSyntax', () => {
		const out = ts.transpileModule("import { type A } from './a';\nimport type { B } from './b';\n", {
			compilerOptions: { verbatimModuleSyntax: true, module: ts.ModuleKind.ESNext }
		}).outputText;
		expect(out).toContain("from './a'");
		expect(out).not.toContain("from './b'");
	});

	it('lists every elementary circle of a knot once, and a file importing itself', () => {
		// a → b → a and a → c → a share a; b → c → b is a third one; s imports itself.
		const root = tree({
			'src/lib/a.ts': "import './b';\nimport './c';\n",
			'src/lib/b.ts': "import './a';\nimport './c';\n",
			'src/lib/c.ts': "import './a';\nimport './b';\n",
			'src/lib/s.ts': "import './s';\n"
		});
		// The complete digraph on 3 nodes has 3 two-cycles and 2 three-cycles (a→b→c→a, a→c→b→a).
		expect(checkImports(root).circles).toEqual([
			['src/lib/a.ts', 'src/lib/b.ts', 'src/lib/a.ts'],
			['src/lib/a.ts', 'src/lib/b.ts', 'src/lib/c.ts', 'src/lib/a.ts'],
			['src/lib/a.ts', 'src/lib/c.ts', 'src/lib/a.ts'],
			['src/lib/a.ts', 'src/lib/c.ts', 'src/lib/b.ts', 'src/lib/a.ts'],
			['src/lib/b.ts', 'src/lib/c.ts', 'src/lib/b.ts'],
			['src/lib/s.ts', 'src/lib/s.ts']
		]);
	});

	it('findCircles counts the circles of a complete digraph and stops at its limit', () => {
		// Elementary circuits of the complete digraph K4: sum over k=2..4 of C(4,k)·(k−1)! = 6 + 8 + 6 = 20
		// (standard combinatorics: a k-set carries (k−1)! distinct directed cycles).
		const nodes = ['a', 'b', 'c', 'd'];
		const adj = new Map(nodes.map((v) => [v, nodes.filter((w) => w !== v)]));
		expect(findCircles(adj).circles).toHaveLength(20);
		const capped = findCircles(adj, 5);
		expect(capped.truncated).toBe(true);
		expect(capped.circles).toHaveLength(5);
	});
});

describe('reading imports', () => {
	it('finds every ES module form and ignores comments, strings and template text', () => {
		const code = [
			"import a from 'a';",
			"import * as b from 'b';",
			"import 'c';",
			"export { d } from 'd';",
			"export * from 'e';",
			"const f = await import('f');",
			"// import g from 'g';",
			'const h = "import h from \'h\'";',
			"const i = `from 'i'`;",
			"/* export * from 'j' */"
		].join('\n');
		expect(parseImports(code, 'x.ts').map((i) => [i.spec, i.line, i.typeOnly, i.dynamic])).toEqual([
			['a', 1, false, false],
			['b', 2, false, false],
			['c', 3, false, false],
			['d', 4, false, false],
			['e', 5, false, false],
			['f', 6, false, true]
		]);
	});

	it('reads the <script> and <script module> blocks of a component with their line numbers', () => {
		const text = [
			'<script module lang="ts">', // 1
			"\texport { x } from './x';", // 2
			'</script>', // 3
			'', // 4
			'<script lang="ts">', // 5
			"\timport Y from './y.svelte';", // 6
			'</script>', // 7
			'<!-- <script>import z from "z";</script> -->', // 8
			"<p>import w from 'w'</p>" // 9
		].join('\n');
		const found = svelteScripts(text).flatMap((b) =>
			parseImports(b.code, 'c.svelte').map((i) => [i.spec, i.line + b.lineOffset])
		);
		expect(found).toEqual([
			['./x', 2],
			['./y.svelte', 6]
		]);
	});

	it('resolves $lib, relative paths, .svelte.ts, /index.ts and .js written for .ts', () => {
		const root = tree({
			'src/lib/physics/index.ts': 'export const p = 1;\n',
			'src/lib/state.svelte.ts': 'export const s = 1;\n',
			'src/lib/util.ts': 'export const u = 1;\n',
			'src/lib/server/db.ts': 'export const db = 1;\n',
			'src/lib/pick.svelte': '<p></p>\n',
			'src/lib/components/x.svelte': [
				'<script lang="ts">',
				"\timport { p } from '$lib/physics';",
				"\timport { s } from '$lib/state.svelte';",
				"\timport { u } from '$lib/util.js';",
				"\timport Pick from '$lib/pick.svelte';",
				"\timport { db } from '$lib/server/db';",
				'</script>'
			].join('\n')
		});
		// Only the last one breaks a rule; that it is found at all shows the others resolved too.
		expect(brief(root)).toEqual(['2 src/lib/components/x.svelte:6 src/lib/server/db.ts']);
		expect(checkImports(root).warnings).toEqual([]);
	});
});

describe('the command', () => {
	it('prints each violation as file:line  imports  target  — rule, then the summary, and exits 1', () => {
		const root = tree({
			'src/lib/server/db.ts': 'export const db = 1;\n',
			'src/routes/+page.server.ts': "\n\nimport { db } from '$lib/server/db';\n"
		});
		expect(run(root)).toEqual({
			status: 1,
			stdout:
				'src/routes/+page.server.ts:3  imports  src/lib/server/db.ts  — rule 5: routes never import $lib/server/db (call a service)\n' +
				'import directions: 2 files, 1 imports, 1 violations\n',
			stderr: ''
		});
	});

	it('warns about an import that points at a missing project file, without failing on it', () => {
		const root = tree({ 'src/lib/a.ts': "import { gone } from './gone';\n" });
		const r = run(root);
		expect(r.status).toBe(0);
		expect(r.stderr).toBe(
			'warning: src/lib/a.ts:1  imports  ./gone  — does not resolve to a file of the project\n'
		);
	});

	it('says so, and exits 2, when there is no src/ folder or an unknown argument', () => {
		const empty = fs.mkdtempSync(path.join(os.tmpdir(), 'envelo-imports-'));
		made.push(empty);
		const r = run(empty);
		expect(r.status).toBe(2);
		expect(r.stderr).toBe(`check-imports: no src/ folder under ${empty}\n`);

		const bad = spawnSync(process.execPath, [SCRIPT, '--fix'], { encoding: 'utf8' });
		expect(bad.status).toBe(2);
		expect(bad.stderr).toContain('unknown argument --fix');
	});
});
