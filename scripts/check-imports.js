#!/usr/bin/env node
// Fails the build when an import under src/ goes the wrong way or closes a circle.
//
//   node scripts/check-imports.js [--root DIR]     (DIR defaults to the checkout this script lives in)
//
// Every import in src/**/*.{ts,js,svelte} (for .svelte: the <script> blocks) is parsed with TypeScript's
// own parser, so comments, strings and template text are never mistaken for imports. Each one is
// resolved to a project file ($lib/x → src/lib/x; relative paths; then .ts, .js, .svelte, .svelte.ts,
// .svelte.js, /index.ts, /index.js; a written .js may stand for .ts). Packages, $app/…, $env/…,
// $service-worker and SvelteKit's generated ./$types are external.
//
// Rules (each broken one prints `file:line  imports  target  — rule N: …`; exit 1 if any):
//   1. src/lib/physics/** imports nothing of the project outside src/lib/physics/, and nothing from
//      $app, $env or svelte: the physics must run anywhere (tests, workers, the browser).
//   2. src/lib/components/** never imports src/lib/server/** or src/routes/**.
//   3. src/lib/server/** never imports src/lib/components/** or src/routes/**.
//   4. Shared modules (src/lib/** outside server/ and components/) never import server/, components/
//      or routes/.
//   5. Routes never import $lib/server/db: they call a service, which owns the queries.
//   6. Imports that leave their folder use $lib/…, not ../ (./ into the same folder or below is fine;
//      inside src/lib/physics/ relative imports are fine, and so are a route's own `_`-prefixed helpers;
//      stylesheets and other assets are exempt).
//   7. No circles in the module graph of src/. Only imports that survive the build count: `import type`
//      and `export type … from` are erased by the compiler, so they are left out. An import whose
//      names are all marked inline (`import { type A } from …`) is kept: with verbatimModuleSyntax,
//      which SvelteKit's generated tsconfig turns on, it is emitted as `import {} from …` and still
//      loads the module. Dynamic import() is kept too. Each elementary circle is printed once.
// Rules 1–6 look at every import, type-only ones included: a type still ties the two folders together.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import ts from 'typescript';

/** Files whose imports are read. */
const SOURCE_EXT = ['.ts', '.js', '.mjs', '.cjs', '.mts', '.cts', '.svelte'];
/** Targets that are modules (nodes of the graph); anything else (css, fonts, images) is an asset. */
const MODULE_EXT = [...SOURCE_EXT, '.json'];
/** Suffixes tried, in this order, when a specifier does not name an existing file. */
const TRY_SUFFIX = ['.ts', '.js', '.svelte', '.svelte.ts', '.svelte.js', '/index.ts', '/index.js'];
/** More circles than this are summarised rather than listed. */
const MAX_CIRCLES = 200;

const RULES = {
	1: 'rule 1: physics imports nothing outside src/lib/physics/ (nor $app, $env, svelte)',
	2: 'rule 2: components never import server code or routes',
	3: 'rule 3: server code never imports components or routes',
	4: 'rule 4: shared modules never import server/, components/ or routes/',
	5: 'rule 5: routes never import $lib/server/db (call a service)',
	6: 'rule 6: use $lib/… instead of ../ across folders',
	7: 'rule 7: circle'
};

/**
 * @typedef {object} ImportRef
 * @property {string} file      importing file, relative to the root (posix separators)
 * @property {number} line      1-based line of the specifier
 * @property {string} spec      the specifier as written
 * @property {boolean} typeOnly `import type` / `export type … from` / a type-position import('…')
 * @property {boolean} dynamic  import('…') call
 * @property {'project' | 'external' | 'generated'} kind
 * @property {string | null} target  resolved project file (relative), or null
 * @property {string | null} wanted  for an unresolved project import: the path it points at
 */

/**
 * @typedef {object} Violation
 * @property {string} file
 * @property {number} line
 * @property {string} target  shown after "imports"
 * @property {number} rule
 * @property {string} message
 */

/**
 * @typedef {object} CheckResult
 * @property {number} files
 * @property {number} imports
 * @property {Violation[]} violations
 * @property {string[]} warnings
 * @property {string[][]} circles  each one a chain of files, first file repeated at the end
 */

/** @param {string} p */
const posix = (p) => p.split(path.sep).join('/');

/**
 * Every source file under dir, relative to root, sorted.
 * @param {string} root
 * @param {string} dir
 * @returns {string[]}
 */
function walk(root, dir) {
	/** @type {string[]} */
	const out = [];
	for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		if (entry.isDirectory()) {
			if (entry.name === 'node_modules' || entry.name.startsWith('.')) continue;
			out.push(...walk(root, full));
		} else if (entry.isFile() && SOURCE_EXT.includes(path.extname(entry.name))) {
			out.push(posix(path.relative(root, full)));
		}
	}
	return out.sort();
}

/**
 * The <script> blocks of a .svelte file, with the line their content starts on (0-based). HTML
 * comments are blanked first so a commented-out block is not read.
 * @param {string} text
 * @returns {{ code: string, lineOffset: number }[]}
 */
export function svelteScripts(text) {
	const blanked = text.replace(/<!--[\s\S]*?-->/g, (c) => c.replace(/[^\n]/g, ' '));
	/** @type {{ code: string, lineOffset: number }[]} */
	const blocks = [];
	const re = /<script(?:\s[^>]*)?>([\s\S]*?)<\/script\s*>/g;
	for (let m = re.exec(blanked); m; m = re.exec(blanked)) {
		const start = m.index + m[0].indexOf('>') + 1;
		const lineOffset = blanked.slice(0, start).split('\n').length - 1;
		blocks.push({ code: text.slice(start, start + m[1].length), lineOffset });
	}
	return blocks;
}

/**
 * The import specifiers of one piece of TypeScript/JavaScript.
 * @param {string} code
 * @param {string} fileName  only used by the parser for diagnostics
 * @param {boolean} declarationFile  in a .d.ts everything is type-only
 * @returns {{ spec: string, line: number, typeOnly: boolean, dynamic: boolean }[]}
 */
export function parseImports(code, fileName, declarationFile = false) {
	const sf = ts.createSourceFile(fileName, code, ts.ScriptTarget.Latest, true, ts.ScriptKind.TS);
	/** @type {{ spec: string, line: number, typeOnly: boolean, dynamic: boolean }[]} */
	const found = [];
	/** @param {ts.Node} node @param {boolean} typeOnly @param {boolean} dynamic */
	const add = (node, typeOnly, dynamic) => {
		if (!ts.isStringLiteralLike(node)) return;
		const line = sf.getLineAndCharacterOfPosition(node.getStart(sf)).line + 1;
		found.push({ spec: node.text, line, typeOnly: typeOnly || declarationFile, dynamic });
	};
	/** @param {ts.Node} node */
	const visit = (node) => {
		if (ts.isImportDeclaration(node)) {
			add(node.moduleSpecifier, !!node.importClause?.isTypeOnly, false);
		} else if (ts.isExportDeclaration(node) && node.moduleSpecifier) {
			add(node.moduleSpecifier, node.isTypeOnly, false);
		} else if (ts.isImportEqualsDeclaration(node) && ts.isExternalModuleReference(node.moduleReference)) {
			add(node.moduleReference.expression, node.isTypeOnly, false);
		} else if (ts.isImportTypeNode(node)) {
			// `typeof import('x')`, `import('x').T`: a type position, erased like `import type`.
			const arg = node.argument;
			if (ts.isLiteralTypeNode(arg)) add(arg.literal, true, false);
		} else if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword) {
			if (node.arguments.length > 0) add(node.arguments[0], false, true);
		}
		ts.forEachChild(node, visit);
	};
	visit(sf);
	return found;
}

/**
 * The first existing file for a path without (or with) its extension, relative to root, or null.
 * @param {string} root
 * @param {string} rel  relative to root, posix
 * @returns {string | null}
 */
function resolveFile(root, rel) {
	/** @param {string} r */
	const isFile = (r) => {
		try {
			return fs.statSync(path.join(root, r)).isFile();
		} catch {
			return false;
		}
	};
	if (isFile(rel)) return rel;
	for (const suffix of TRY_SUFFIX) if (isFile(rel + suffix)) return rel + suffix;
	// TypeScript's convention: './x.js' in the source names './x.ts'.
	if (/\.js$/.test(rel)) {
		const asTs = rel.replace(/\.js$/, '.ts');
		if (isFile(asTs)) return asTs;
	}
	return null;
}

/**
 * @param {string} root
 * @param {string} file  importing file, relative
 * @param {string} spec
 * @returns {{ kind: 'project' | 'external' | 'generated', target: string | null, wanted: string | null }}
 */
export function resolveImport(root, file, spec) {
	const bare = spec.replace(/[?#].*$/, '');
	if (/(^|\/)\$types(\.js)?$/.test(bare)) return { kind: 'generated', target: null, wanted: null };
	/** @type {string | null} */
	let rel = null;
	if (bare === '$lib' || bare.startsWith('$lib/')) {
		rel = path.posix.join('src/lib', bare.slice('$lib'.length));
	} else if (bare.startsWith('./') || bare.startsWith('../') || bare === '.' || bare === '..') {
		rel = path.posix.normalize(path.posix.join(path.posix.dirname(file), bare));
	}
	if (rel === null) return { kind: 'external', target: null, wanted: null };
	rel = rel.replace(/\/$/, '');
	const target = resolveFile(root, rel);
	return { kind: 'project', target, wanted: target ? null : rel };
}

/** @param {string} p */
const area = (p) => {
	if (p.startsWith('src/lib/physics/')) return 'physics';
	if (p.startsWith('src/lib/components/')) return 'components';
	if (p.startsWith('src/lib/server/')) return 'server';
	if (p.startsWith('src/lib/')) return 'shared';
	if (p.startsWith('src/routes/')) return 'routes';
	return 'other';
};

/** @param {string} p */
const isModule = (p) => MODULE_EXT.some((ext) => p.endsWith(ext));

/** @param {string} p  resolved or wanted path */
const isDb = (p) => {
	const noExt = p.replace(/\.(ts|js)$/, '');
	return noExt === 'src/lib/server/db' || noExt.startsWith('src/lib/server/db/');
};

/**
 * A route's own helper: a `_`-prefixed file or folder under src/routes (SvelteKit's convention for files
 * that are not routes), imported from a route beside or below it. `$lib` cannot name these.
 * @param {string} from @param {string} to
 */
const isRouteLocal = (from, to) =>
	from.startsWith('src/routes/') &&
	to.startsWith('src/routes/') &&
	/\/_[^/]+/.test(to.slice('src/routes'.length));

/** @param {string} spec */
const isKitOrSvelte = (spec) =>
	/^\$(app|env)(\/|$)/.test(spec) || spec === '$service-worker' || /^svelte(\/|$)/.test(spec);

/**
 * Rules 1–6 for one import.
 * @param {ImportRef} ref
 * @returns {number[]}  the rules it breaks
 */
function brokenRules(ref) {
	/** @type {number[]} */
	const broken = [];
	const from = area(ref.file);
	const to = ref.target ?? ref.wanted;
	if (from === 'physics') {
		if (ref.kind === 'external' && isKitOrSvelte(ref.spec)) broken.push(1);
		if (ref.kind === 'project' && to && area(to) !== 'physics') broken.push(1);
	}
	if (ref.kind !== 'project' || !to) return broken;
	const toArea = area(to);
	if (from === 'components' && (toArea === 'server' || toArea === 'routes')) broken.push(2);
	if (from === 'server' && (toArea === 'components' || toArea === 'routes')) broken.push(3);
	if (from === 'shared' && (toArea === 'server' || toArea === 'components' || toArea === 'routes')) {
		broken.push(4);
	}
	if (from === 'routes' && isDb(to)) broken.push(5);
	if (
		from !== 'physics' &&
		to.startsWith('src/') &&
		/^\.\.(\/|$)/.test(ref.spec) &&
		(ref.target === null || isModule(ref.target)) &&
		!isRouteLocal(ref.file, to)
	) {
		broken.push(6);
	}
	return broken;
}

/**
 * Strongly connected components (Tarjan), iterative so a deep tree cannot overflow the stack.
 * @param {string[]} nodes
 * @param {Map<string, string[]>} adj
 * @returns {string[][]}
 */
function tarjan(nodes, adj) {
	let next = 0;
	/** @type {Map<string, number>} */ const index = new Map();
	/** @type {Map<string, number>} */ const low = new Map();
	/** @type {Set<string>} */ const onStack = new Set();
	/** @type {string[]} */ const stack = [];
	/** @type {string[][]} */ const sccs = [];
	for (const start of nodes) {
		if (index.has(start)) continue;
		/** @type {{ v: string, i: number }[]} */
		const work = [{ v: start, i: 0 }];
		index.set(start, next);
		low.set(start, next++);
		stack.push(start);
		onStack.add(start);
		while (work.length) {
			const frame = work[work.length - 1];
			const succ = adj.get(frame.v) ?? [];
			if (frame.i < succ.length) {
				const w = succ[frame.i++];
				if (!index.has(w)) {
					index.set(w, next);
					low.set(w, next++);
					stack.push(w);
					onStack.add(w);
					work.push({ v: w, i: 0 });
				} else if (onStack.has(w)) {
					low.set(
						frame.v,
						Math.min(/** @type {number} */ (low.get(frame.v)), /** @type {number} */ (index.get(w)))
					);
				}
				continue;
			}
			work.pop();
			if (work.length) {
				const parent = work[work.length - 1].v;
				low.set(
					parent,
					Math.min(/** @type {number} */ (low.get(parent)), /** @type {number} */ (low.get(frame.v)))
				);
			}
			if (low.get(frame.v) === index.get(frame.v)) {
				/** @type {string[]} */
				const scc = [];
				let w;
				do {
					w = /** @type {string} */ (stack.pop());
					onStack.delete(w);
					scc.push(w);
				} while (w !== frame.v);
				sccs.push(scc);
			}
		}
	}
	return sccs;
}

/**
 * Every elementary circle of the graph, each once, starting at its alphabetically first file
 * (Johnson's algorithm within each strongly connected component). Stops after `limit`.
 * @param {Map<string, string[]>} adj  successor lists, sorted
 * @param {number} limit
 * @returns {{ circles: string[][], truncated: boolean }}
 */
export function findCircles(adj, limit = MAX_CIRCLES) {
	const nodes = [...adj.keys()].sort();
	/** @type {string[][]} */
	const circles = [];
	let truncated = false;
	for (const scc of tarjan(nodes, adj)) {
		const members = new Set(scc);
		if (scc.length === 1 && !(adj.get(scc[0]) ?? []).includes(scc[0])) continue;
		const ordered = [...scc].sort();
		for (let s = 0; s < ordered.length && !truncated; s++) {
			const startNode = ordered[s];
			const allowed = new Set(ordered.slice(s));
			/** @param {string} v */
			const succ = (v) => (adj.get(v) ?? []).filter((w) => members.has(w) && allowed.has(w));
			/** @type {Set<string>} */ const blocked = new Set();
			/** @type {Map<string, Set<string>>} */ const blockMap = new Map();
			/** @type {string[]} */ const pathNow = [];
			/** @param {string} v */
			const unblock = (v) => {
				/** @type {string[]} */
				const todo = [v];
				while (todo.length) {
					const u = /** @type {string} */ (todo.pop());
					if (!blocked.has(u)) continue;
					blocked.delete(u);
					const waiting = blockMap.get(u);
					if (waiting) {
						todo.push(...waiting);
						waiting.clear();
					}
				}
			};
			/** @param {string} v @returns {boolean} */
			const circuit = (v) => {
				let closed = false;
				pathNow.push(v);
				blocked.add(v);
				for (const w of succ(v)) {
					if (truncated) break;
					if (w === startNode) {
						circles.push([...pathNow, startNode]);
						if (circles.length >= limit) truncated = true;
						closed = true;
					} else if (!blocked.has(w) && circuit(w)) {
						closed = true;
					}
				}
				if (closed) unblock(v);
				else
					for (const w of succ(v)) {
						if (!blockMap.has(w)) blockMap.set(w, new Set());
						/** @type {Set<string>} */ (blockMap.get(w)).add(v);
					}
				pathNow.pop();
				return closed;
			};
			circuit(startNode);
		}
		if (truncated) break;
	}
	circles.sort((x, y) => x.join('\n').localeCompare(y.join('\n')));
	return { circles, truncated };
}

/**
 * Check the tree under root.
 * @param {string} root
 * @returns {CheckResult}
 */
export function checkImports(root) {
	const srcDir = path.join(root, 'src');
	if (!fs.existsSync(srcDir) || !fs.statSync(srcDir).isDirectory()) {
		throw new Error(`check-imports: no src/ folder under ${root}`);
	}
	const files = walk(root, srcDir);
	/** @type {ImportRef[]} */
	const refs = [];
	for (const file of files) {
		const text = fs.readFileSync(path.join(root, file), 'utf8');
		const pieces = file.endsWith('.svelte') ? svelteScripts(text) : [{ code: text, lineOffset: 0 }];
		for (const { code, lineOffset } of pieces) {
			for (const imp of parseImports(code, file, file.endsWith('.d.ts'))) {
				refs.push({ file, ...imp, line: imp.line + lineOffset, ...resolveImport(root, file, imp.spec) });
			}
		}
	}

	/** @type {Violation[]} */
	const violations = [];
	/** @type {string[]} */
	const warnings = [];
	for (const ref of refs) {
		if (ref.kind === 'project' && ref.target === null) {
			warnings.push(
				`${ref.file}:${ref.line}  imports  ${ref.spec}  — does not resolve to a file of the project`
			);
		}
		const shown =
			ref.target ?? (ref.kind === 'project' ? `${ref.spec} (unresolved: ${ref.wanted})` : ref.spec);
		for (const rule of brokenRules(ref)) {
			violations.push({
				file: ref.file,
				line: ref.line,
				target: shown,
				rule,
				message: RULES[/** @type {1} */ (rule)]
			});
		}
	}

	// Rule 7: the graph of modules under src/, value imports only.
	/** @type {Map<string, Map<string, number>>} */
	const edgeLine = new Map();
	for (const file of files) edgeLine.set(file, new Map());
	for (const ref of refs) {
		if (ref.typeOnly || !ref.target || !ref.target.startsWith('src/') || !isModule(ref.target)) continue;
		const out = /** @type {Map<string, number>} */ (edgeLine.get(ref.file));
		if (!edgeLine.has(ref.target)) edgeLine.set(ref.target, new Map()); // e.g. a .json module
		if (!out.has(ref.target)) out.set(ref.target, ref.line);
	}
	/** @type {Map<string, string[]>} */
	const adj = new Map([...edgeLine].map(([v, out]) => [v, [...out.keys()].sort()]));
	const { circles, truncated } = findCircles(adj);
	for (const circle of circles) {
		violations.push({
			file: circle[0],
			line: /** @type {number} */ (edgeLine.get(circle[0])?.get(circle[1])),
			target: circle[1],
			rule: 7,
			message: `${RULES[7]} ${circle.join(' → ')}`
		});
	}
	if (truncated) warnings.push(`more than ${MAX_CIRCLES} circles: only the first ${MAX_CIRCLES} are listed`);

	violations.sort((a, b) => a.rule - b.rule || a.file.localeCompare(b.file) || a.line - b.line);
	return { files: files.length, imports: refs.length, violations, warnings, circles };
}

/** @param {Violation} v */
export const formatViolation = (v) => `${v.file}:${v.line}  imports  ${v.target}  — ${v.message}`;

/** @param {string[]} argv @returns {number} exit code */
export function main(argv) {
	let root = fileURLToPath(new URL('..', import.meta.url));
	for (let i = 0; i < argv.length; i++) {
		if (argv[i] === '--root' && argv[i + 1]) root = path.resolve(argv[++i]);
		else {
			console.error(`check-imports: unknown argument ${argv[i]} (usage: check-imports.js [--root DIR])`);
			return 2;
		}
	}
	/** @type {CheckResult} */
	let result;
	try {
		result = checkImports(root);
	} catch (err) {
		console.error(err instanceof Error ? err.message : String(err));
		return 2;
	}
	for (const v of result.violations) console.log(formatViolation(v));
	for (const w of result.warnings) console.error(`warning: ${w}`);
	console.log(
		`import directions: ${result.files} files, ${result.imports} imports, ${result.violations.length} violations`
	);
	return result.violations.length > 0 ? 1 : 0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
	process.exitCode = main(process.argv.slice(2));
}
