// The reach of a library correction: one material used by 10,000 elements across 2,000 dwellings, all on
// its revision 1, then revision 2 is written (λ corrected). Generated into BENCH_DATABASE_URL (npm run
// bench starts a throwaway one), with each element's full stored result, issued reports on most
// dwellings, and 5,000 elements of another material beside them. Prints the impact query's time (which
// elements use an older revision, grouped by dwelling, with the U now and recomputed with revision 2, the
// limit, flips, moisture, reports and status) beside a bare indexed count of the same rows.
// Target: the impact query under 300 ms. Invented data, for the benchmark only.
import { register } from 'node:module';
import knex, { type Knex } from 'knex';
import { randomUUID, randomBytes, createHash } from 'node:crypto';
import { loadavg } from 'node:os';

// Outside SvelteKit: stand in for its two virtual modules that the server code imports.
register(
	'data:text/javascript,' +
		encodeURIComponent(`
export async function resolve(spec, ctx, next) {
	if (spec === '$app/environment') return { url: 'data:text/javascript,export const building=false,dev=false,browser=false;', shortCircuit: true };
	if (spec === '$env/dynamic/private') return { url: 'data:text/javascript,export const env=process.env;', shortCircuit: true };
	return next(spec, ctx);
}`)
);

const url = process.env.BENCH_DATABASE_URL;
if (!url) {
	console.log(
		'library-reach bench: BENCH_DATABASE_URL is not set (run `npm run bench -- library-reach`); skipped'
	);
	process.exit(0);
}
process.env.DATABASE_URL = url;

const DWELLINGS = 2000;
const PER_DWELLING = 5;
const OTHER_ELEMENTS = 5000;
/** Thicknesses of the material's layer, mm: a programme built from a few templates, each in the board
 * thicknesses it comes in (common practice, no source). Identical inputs are calculated once. */
const THICKNESSES = [
	50, 60, 70, 75, 80, 90, 100, 110, 120, 125, 130, 140, 150, 160, 170, 180, 200, 220, 240, 250
];
const RUNS = 7;

const { analyseElement, ENGINE_VERSION } = await import('../src/lib/physics');
const { toElementInput } = await import('../src/lib/dwellings/element-input');
type StoredLayer = import('../src/lib/dwellings/element-input').StoredLayer;
const { loadReachWith } = await import('../src/lib/server/library/reach-query');

const db: Knex = knex({ client: 'pg', connection: url, pool: { min: 0, max: 4 } });
const months = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
}));

type Mat = { materialId: string; revisionId: string; code: string; lambda: number; mu: number };

async function material(
	orgId: string,
	code: string,
	category: string,
	lambda: number,
	mu: number
): Promise<Mat> {
	const materialId = randomUUID();
	const revisionId = randomUUID();
	await db.transaction(async (trx) => {
		await trx('materials').insert({
			id: materialId,
			organisation_id: orgId,
			code,
			current_revision_id: revisionId
		});
		await trx('material_revisions').insert({
			id: revisionId,
			organisation_id: orgId,
			material_id: materialId,
			revision: 1,
			name: code,
			category,
			lambda,
			lambda_kind: 'declared',
			mu_dry: mu,
			status: 'verified'
		});
	});
	return { materialId, revisionId, code, lambda, mu };
}

async function organisation() {
	const orgId = randomUUID();
	const userId = randomUUID();
	await db('organisations').insert({ id: orgId, name: `Bench ${orgId.slice(0, 6)}`, slug: `bench-${orgId}` });
	await db('users').insert({
		id: userId,
		email: `bench-${userId.slice(0, 8)}@example.test`,
		name: 'Bench assessor'
	});
	await db('memberships').insert({ organisation_id: orgId, user_id: userId, role: 'admin' });
	const [climate] = await db('climates')
		.insert({
			organisation_id: orgId,
			name: 'Bench climate',
			source: 'invented',
			illustrative: true,
			months: JSON.stringify(months)
		})
		.returning('id');
	await db('limit_tables').insert({
		organisation_id: orgId,
		name: 'Bench limits',
		edition: '1',
		is_default: true,
		limits: JSON.stringify({
			'external-wall': 0.3,
			'pitched-roof-ceiling': 0.16,
			'ground-floor': 0.25,
			'flat-roof': 0.2
		})
	});
	return { orgId, userId, climateId: climate.id as string };
}

type Template = {
	kind: string;
	heatFlow: 'horizontal' | 'upward' | 'downward';
	layers: (t: number) => StoredLayer[];
};

function templates(m: Record<string, Mat>, target: Mat): Template[] {
	const L = (x: Mat, t: number, extra: Partial<StoredLayer> = {}): StoredLayer => ({
		name: x.code,
		thicknessMm: t,
		lambda: x.lambda,
		mu: x.mu,
		materialId: x.materialId,
		materialRevisionId: x.revisionId,
		materialCode: x.code,
		...extra
	});
	return [
		{
			kind: 'external-wall',
			heatFlow: 'horizontal',
			layers: (t) => [L(m.plaster, 13), L(m.block, 100), L(target, t), L(m.brick, 102)]
		},
		{
			kind: 'external-wall',
			heatFlow: 'horizontal',
			layers: (t) => [
				L(m.board, 12.5),
				L(target, t, { bridge: { lambda: 0.13, fraction: 0.15 } }),
				L(m.brick, 102)
			]
		},
		{
			kind: 'pitched-roof-ceiling',
			heatFlow: 'upward',
			layers: (t) => [L(m.board, 12.5), L(target, t + 100)]
		},
		{
			kind: 'ground-floor',
			heatFlow: 'downward',
			layers: (t) => [L(m.screed, 65), L(target, t), L(m.slab, 150)]
		},
		{ kind: 'flat-roof', heatFlow: 'upward', layers: (t) => [L(m.board, 12.5), L(m.slab, 150), L(target, t)] }
	];
}

const results = new Map<string, string>();
/** The stored result of a build-up, as the element service stores it (computed once per distinct input). */
function storedResult(heatFlow: Template['heatFlow'], layers: StoredLayer[]): string {
	const input = toElementInput(
		{ heatFlow, buildUp: { layers }, internal: { temperature: 20, humidityClass: 3 } },
		months
	);
	const key = JSON.stringify(input);
	let hit = results.get(key);
	if (!hit) {
		hit = JSON.stringify(analyseElement(input));
		results.set(key, hit);
	}
	return hit;
}

const STATUSES = [
	'issued',
	'issued',
	'issued',
	'accepted',
	'awaiting-review',
	'draft',
	'changed-after-acceptance',
	'issued',
	'draft',
	'returned'
];

async function seedDwellings(o: Awaited<ReturnType<typeof organisation>>, tpl: Template[]) {
	for (let start = 0; start < DWELLINGS; start += 100) {
		await db.transaction(async (trx) => {
			const dRows = Array.from({ length: Math.min(100, DWELLINGS - start) }, (_, k) => ({
				id: randomUUID(),
				organisation_id: o.orgId,
				reference: `R-${String(start + k).padStart(5, '0')}`,
				address: `${start + k} Bench Row`,
				assessor_id: o.userId,
				status: STATUSES[(start + k) % STATUSES.length],
				climate_id: o.climateId
			}));
			await trx('dwellings').insert(dRows);
			const eRows: Record<string, unknown>[] = [];
			const reports: Record<string, unknown>[] = [];
			dRows.forEach((d, k) => {
				const n = start + k;
				tpl.slice(0, PER_DWELLING).forEach((t, p) => {
					const layers = t.layers(THICKNESSES[(n + p) % THICKNESSES.length]);
					eRows.push({
						organisation_id: o.orgId,
						dwelling_id: d.id,
						position: p,
						name: `${t.kind} ${p + 1}`,
						kind: t.kind,
						area: 20,
						heat_flow: t.heatFlow,
						build_up: JSON.stringify({ layers }),
						internal: JSON.stringify({ temperature: 20, humidityClass: 3 }),
						last_result: storedResult(t.heatFlow, layers),
						engine_version: ENGINE_VERSION
					});
				});
				if (d.status !== 'draft') reports.push(reportRow(o, d.id, d.reference));
			});
			await trx('elements').insert(eRows);
			if (reports.length) await trx('reports').insert(reports);
		});
	}
}

function reportRow(o: { orgId: string; userId: string }, dwellingId: string, reference: string) {
	const pdf = Buffer.from(`%PDF bench ${reference}`);
	return {
		organisation_id: o.orgId,
		number: `N-${reference}`,
		revision: 1,
		scope: 'dwelling',
		dwelling_id: dwellingId,
		snapshot: JSON.stringify({ dwelling: { id: dwellingId }, elements: [] }),
		engine_version: ENGINE_VERSION,
		verification_code: randomBytes(8).toString('hex'),
		sha256: createHash('sha256').update(pdf).digest('hex'),
		pdf,
		issued_by: o.userId
	};
}

/** Elements of another material of the same organisation, in dwellings of their own: rows the index must pass by. */
async function seedOthers(o: Awaited<ReturnType<typeof organisation>>, tpl: Template[]) {
	const per = 5;
	for (let start = 0; start < OTHER_ELEMENTS / per; start += 100) {
		await db.transaction(async (trx) => {
			const dRows = Array.from({ length: 100 }, (_, k) => ({
				id: randomUUID(),
				organisation_id: o.orgId,
				reference: `X-${String(start + k).padStart(5, '0')}`,
				address: 'Elsewhere',
				climate_id: o.climateId
			}));
			await trx('dwellings').insert(dRows);
			const eRows = dRows.flatMap((d, k) =>
				tpl.slice(0, per).map((t, p) => {
					const layers = t.layers(THICKNESSES[(start + k) % THICKNESSES.length]);
					return {
						organisation_id: o.orgId,
						dwelling_id: d.id,
						position: p,
						name: t.kind,
						kind: t.kind,
						area: 20,
						heat_flow: t.heatFlow,
						build_up: JSON.stringify({ layers }),
						internal: JSON.stringify({ temperature: 20, humidityClass: 3 }),
						last_result: storedResult(t.heatFlow, layers),
						engine_version: ENGINE_VERSION
					};
				})
			);
			await trx('elements').insert(eRows);
		});
	}
}

/** Revision 2 of the material: λ corrected upwards (superseding revision 1), as a correction writes it. */
async function revise(orgId: string, m: Mat, lambda: number): Promise<string> {
	const id = randomUUID();
	await db.transaction(async (trx) => {
		await trx('material_revisions').insert({
			id,
			organisation_id: orgId,
			material_id: m.materialId,
			revision: 2,
			name: m.code,
			category: 'insulation',
			lambda,
			lambda_kind: 'declared',
			mu_dry: m.mu,
			status: 'unverified'
		});
		await trx('material_revisions').where({ id: m.revisionId }).update({ status: 'superseded' });
		await trx('materials').where({ id: m.materialId }).update({ current_revision_id: id });
	});
	return id;
}

async function setup() {
	const o = await organisation();
	const m: Record<string, Mat> = {};
	for (const [code, category, lambda, mu] of [
		['plaster', 'plasters-linings', 0.4, 10],
		['block', 'masonry', 0.15, 10],
		['brick', 'masonry', 0.77, 10],
		['board', 'plasters-linings', 0.21, 4],
		['screed', 'concrete', 1.15, 30],
		['slab', 'concrete', 2.0, 80],
		['other-wool', 'insulation', 0.037, 1]
	] as const)
		m[code] = await material(o.orgId, `B-${code}`, category, lambda, mu);
	const target = await material(o.orgId, 'B-REACH-PIR', 'insulation', 0.022, 60);
	await seedDwellings(o, templates(m, target));
	await seedOthers(o, templates(m, m['other-wool']));
	const current = await revise(o.orgId, target, 0.024);
	await db.raw('ANALYZE elements; ANALYZE dwellings; ANALYZE reports');
	return { ...o, target, current };
}

const phasesText = (p: Record<string, number>, runs: number) =>
	Object.entries(p)
		.map(([k, v]) => `${k} ${(v / runs).toFixed(0)} ms`)
		.join(', ');

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** The floor: a count of the same rows, by the same indexed containment, nothing else read. */
async function bareCount(orgId: string, m: Mat): Promise<number> {
	const { rows } = await db.raw(
		`SELECT count(*)::int AS n FROM elements WHERE organisation_id = ? AND build_up -> 'layers' @> ?::jsonb`,
		[orgId, JSON.stringify([{ materialId: m.materialId, materialRevisionId: m.revisionId }])]
	);
	return rows[0].n;
}

async function main() {
	const t0 = performance.now();
	const s = await setup();
	console.log(
		`generated ${DWELLINGS} dwellings × ${PER_DWELLING} elements using the material (+ ${OTHER_ELEMENTS} elements of another) in ${((performance.now() - t0) / 1000).toFixed(1)} s (${results.size} distinct stored results)`
	);
	const plan = await db.raw(
		`EXPLAIN SELECT count(*) FROM elements WHERE organisation_id = ? AND build_up -> 'layers' @> ?::jsonb`,
		[s.orgId, JSON.stringify([{ materialId: s.target.materialId, materialRevisionId: s.target.revisionId }])]
	);
	// most rows of this organisation match, so the planner reads the table rather than the GIN index;
	// for a material in a small share of the rows it uses the index (elements_layers_path)
	console.log(
		'plan of the count:',
		plan.rows.map((r: Record<string, string>) => r['QUERY PLAN'].trim()).join(' | ')
	);

	const few = await db.raw(
		`EXPLAIN SELECT count(*) FROM elements WHERE organisation_id = ? AND build_up -> 'layers' @> ?::jsonb`,
		[s.orgId, JSON.stringify([{ materialId: s.target.materialId, materialRevisionId: s.current }])]
	);
	console.log(
		'plan for a revision few elements use:',
		few.rows.map((r: Record<string, string>) => r['QUERY PLAN'].trim()).join(' | ')
	);
	const floors: number[] = [];
	let n = 0;
	for (let i = 0; i < RUNS; i++) {
		const f0 = performance.now();
		n = await bareCount(s.orgId, s.target);
		floors.push(performance.now() - f0);
	}
	const tf = median(floors);
	console.log(
		`bare count of the same rows (same containment): ${n} elements, ${tf.toFixed(1)} ms (median of ${RUNS})`
	);

	// the first look after the correction calculates each distinct input once and keeps it
	const coldPhases: Record<string, number> = {};
	const stats = { kept: 0, calculated: 0 };
	const c0 = performance.now();
	let reach = await loadReachWith(db, s.orgId, s.target.materialId, { timings: coldPhases, stats });
	const cold = performance.now() - c0;
	console.log(
		`first impact query after the correction: ${cold.toFixed(0)} ms, ${stats.calculated} distinct engine inputs calculated (${phasesText(coldPhases, 1)})`
	);
	const times: number[] = [];
	const phases: Record<string, number> = {};
	for (let i = 0; i < RUNS; i++) {
		const q0 = performance.now();
		reach = await loadReachWith(db, s.orgId, s.target.materialId, { timings: phases });
		times.push(performance.now() - q0);
	}
	const tq = median(times);
	const t = reach!.totals;
	console.log(
		`impact query: ${t.elements} elements in ${t.dwellings} dwellings (${t.flips} pass/fail flips, ${t.moistureChanges} moisture changes, ${t.withIssuedReports} dwellings with issued reports, ${t.needsReopening} to reopen first): ${tq.toFixed(0)} ms (median of ${RUNS}; ${phasesText(phases, RUNS)})   target < 300 ms   ${tq < 300 ? 'PASS' : 'FAIL'}`
	);
	console.log(`ratio impact query / bare count: ${(tq / tf).toFixed(1)}×`);
	console.log(
		`load average while measuring: ${loadavg()
			.map((l) => l.toFixed(1))
			.join(' ')} (2 cores shared)`
	);
	await db.destroy();
}

main().catch(async (e) => {
	console.error(e);
	await db.destroy();
	process.exit(1);
});
