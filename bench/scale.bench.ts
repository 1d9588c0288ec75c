// Envelo at scale: one organisation with 100,000 dwellings and 800,000 elements (8 each: two walls, a
// loft, a flat roof, a floor, two windows and a door), generated into BENCH_DATABASE_URL by a few
// INSERT … SELECT generate_series statements. Then, against the built server (BENCH_BUILD_DIR, as in
// http.bench.ts: 20 connections, autocannon, interleaved rounds, medians): the dwellings list searched, filtered
// by status, sorted and paged deep, and one dwelling's page, each beside the trivial /healthz measured in
// the same rounds (the floor); then /healthz measured while the dwelling page is under load. Last, the
// audit recompute of 10,000 of those dwellings (recomputeBatchWith, what the worker runs) beside the
// read-only floor (the same rows read with the same queries, nothing computed).
// Targets (printed, never failed on): the list and the dwelling page p99 < 100 ms with 20 connections.
//
// Opt-in, it takes several minutes: `npm run bench -- scale` (the filter names it), or SCALE_BENCH=1 with
// the whole `npm run bench`. SCALE_DWELLINGS=10000 for a quick run (default 100000); SCALE_RECOMPUTE sets
// the batch (default 10000, at most a tenth of the dwellings). BENCH_SECONDS (4 here) and BENCH_ROUNDS as
// in http.bench.ts. The start script passes the filter on as BENCH_FILTER.
//
// The data is invented for the benchmark. Build-ups, inside conditions and results are the demo seed's
// own elements (db/seeds/04_dwellings.js, computed with the engine), moved onto a copy of the demo library
// in the new organisation, with the insulation thickness varied (each variant computed here with the
// engine). Stored results are kept whole for the two dwellings whose page is measured; everywhere else
// (and in the report snapshots) they keep every figure but drop the per-month and per-node arrays (the
// temperature profile, the Glaser cycle, the surface months): whole, 800,000 of them would be some 20 GB.
// Values no measurement reads are written with lz4 to save minutes (see generate()). The app role may not
// ANALYZE, so the bench waits for autovacuum to analyse and vacuum the new rows before it measures, as a
// real database would have.
import { spawn } from 'node:child_process';
import { createServer } from 'node:net';
import { randomBytes, randomUUID } from 'node:crypto';
import { cpus, loadavg } from 'node:os';
import knex from 'knex';
import autocannon from 'autocannon';
import { analyseElement, ENGINE_VERSION } from '../src/lib/physics';
import { toElementInput, type StoredBuildUp, type StoredLayer } from '../src/lib/dwellings/element-input';
import { loadDwellingRows, recomputeBatchWith } from '../src/lib/server/audit/recompute';

const DB_URL = process.env.BENCH_DATABASE_URL;
if (!DB_URL) {
	console.log('scale bench skipped: set BENCH_DATABASE_URL (npm run bench -- scale prepares it)');
	process.exit(0);
}
const filter = process.env.BENCH_FILTER ?? '';
if (!filter && process.env.SCALE_BENCH !== '1') {
	console.log(
		'scale bench skipped (several minutes): run `npm run bench -- scale`, or set SCALE_BENCH=1 with the whole run'
	);
	process.exit(0);
}
const BUILD = process.env.BENCH_BUILD_DIR ?? 'build';
const DWELLINGS = Math.max(100, Math.floor(Number(process.env.SCALE_DWELLINGS ?? 100_000)));
const RECOMPUTE = Math.max(
	10,
	Math.min(Math.floor(Number(process.env.SCALE_RECOMPUTE ?? 10_000)), Math.floor(DWELLINGS / 10))
);
const CONNECTIONS = 20;
// Longer rounds than http.bench.ts's 2 s: at this size a request can take seconds under 20 connections.
const DURATION = Number(process.env.BENCH_SECONDS ?? 4);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
const TARGET_P99_MS = 100;
/** Page 400 of 25 at full size (rows 9,976–10,000 of the ~94,000 not archived), as deep in a smaller run. */
const DEEP_PAGE = Math.max(2, Math.round((400 * DWELLINGS) / 100_000));
const NORTHFIELD = '00000000-0000-4000-8000-000000000001';

const db = knex({ client: 'pg', connection: DB_URL, pool: { min: 0, max: 4 } });
const seconds = (t0: number) => (performance.now() - t0) / 1000;

/* ------------------------------------------------------------------ the organisation */

const orgId = randomUUID();
const tag = orgId.slice(0, 8);
const people = [
	{ role: 'admin', name: 'Scale admin' },
	...Array.from({ length: 12 }, (_, i) => ({
		role: 'assessor',
		name: `Scale assessor ${String(i + 1).padStart(2, '0')}`
	})),
	{ role: 'supervisor', name: 'Scale supervisor 1' },
	{ role: 'supervisor', name: 'Scale supervisor 2' }
].map((p, i) => ({
	...p,
	id: randomUUID(),
	email: `scale-${tag}-${i}@scale-bench.example.test`
}));
const assessors = people.filter((p) => p.role === 'assessor');
const supervisor = people.find((p) => p.role === 'supervisor')!;

/** The organisation, its members, a copy of the demo library, climate and default limit table. */
async function setupOrganisation() {
	return db.transaction(async (trx) => {
		await trx('organisations').insert({
			id: orgId,
			name: `Scale bench housing programmes ${tag} (invented)`,
			slug: `scale-bench-${tag}`
		});
		await trx('users').insert(people.map((p) => ({ id: p.id, email: p.email, name: p.name })));
		await trx('memberships').insert(
			people.map((p) => ({ organisation_id: orgId, user_id: p.id, role: p.role }))
		);
		const revisions = await trx('materials as m')
			.join('material_revisions as r', 'r.id', 'm.current_revision_id')
			.where('m.organisation_id', NORTHFIELD)
			.select('m.code', 'r.*');
		if (!revisions.length) throw new Error('demo library missing: is the bench database seeded?');
		const byCode = new Map<string, { materialId: string; revisionId: string }>();
		for (const r of revisions) {
			const materialId = randomUUID();
			const revisionId = randomUUID();
			byCode.set(r.code, { materialId, revisionId });
			await trx('materials').insert({ id: materialId, organisation_id: orgId, code: r.code });
			const {
				code: _code,
				id: _id,
				organisation_id: _org,
				material_id: _mat,
				verified_by: _vb,
				created_by: _cb,
				created_at: _ca,
				...values
			} = r;
			await trx('material_revisions').insert({
				...values,
				id: revisionId,
				organisation_id: orgId,
				material_id: materialId,
				revision: 1
			});
			await trx('materials').where({ id: materialId }).update({ current_revision_id: revisionId });
		}
		const demoClimate = await trx('climates')
			.where({ organisation_id: NORTHFIELD, name: 'Demo inland city (invented)' })
			.first('name', 'source', 'illustrative', 'months');
		const demoTable = await trx('limit_tables')
			.where({ organisation_id: NORTHFIELD, is_default: true })
			.first('name', 'edition', 'dated', 'source', 'limits');
		if (!demoClimate || !demoTable) throw new Error('demo climate or limit table missing');
		const [climate] = await trx('climates')
			.insert({ ...demoClimate, months: JSON.stringify(demoClimate.months), organisation_id: orgId })
			.returning(['id', 'name', 'source', 'illustrative', 'months']);
		const [limitTable] = await trx('limit_tables')
			.insert({
				...demoTable,
				limits: JSON.stringify(demoTable.limits),
				organisation_id: orgId,
				is_default: true
			})
			.returning(['id', 'name', 'edition', 'dated', 'source', 'limits']);
		const demoElements = await trx('elements')
			.where({ organisation_id: NORTHFIELD })
			.whereNotNull('build_up')
			.distinctOn('name')
			.orderBy('name')
			.select('name', 'kind', 'heat_flow', 'build_up', 'internal');
		return {
			byCode,
			climate,
			limitTable,
			limits: demoTable.limits as Record<string, number>,
			demoElements
		};
	});
}

/* ------------------------------------------------------------------ the element variants */

type Variant = {
	slot: number;
	variant: number;
	name: string;
	kind: string;
	area: number;
	heat_flow: string;
	build_up: StoredBuildUp | null;
	internal: unknown;
	given_u: number | null;
	given_u_source: string | null;
	/** the stored result without its per-month and per-node arrays (null for windows and doors) */
	result: unknown;
	/** the element as a dwelling report's snapshot freezes it, but for its id */
	snap: Record<string, unknown>;
};

/** Each position of a dwelling draws from these demo constructions (by the seed's names), and its area. */
const SLOTS: { names: string[]; area: number; prefix?: string }[] = [
	{
		names: [
			'External wall, cavity full-fill',
			'External wall, solid brick with external insulation',
			'External wall, timber frame',
			'External wall, solid brick (untreated)'
		],
		area: 62
	},
	{
		names: ['External wall, timber frame', 'External wall, cavity full-fill'],
		area: 18,
		prefix: 'Rear extension: '
	},
	{ names: ['Loft, insulated at ceiling', 'Loft, existing 100 mm between joists'], area: 40 },
	{
		names: ['Flat roof, warm deck', 'Flat roof over bathroom, cold deck without vapour control'],
		area: 9,
		prefix: 'Rear extension: '
	},
	{ names: ['Ground floor, slab with XPS', 'Floor over passage, timber joists'], area: 41 }
];
const GIVEN: { name: string; kind: string; area: number; u: number[] }[] = [
	{ name: 'Windows, front', kind: 'window', area: 8.5, u: [1.4, 1.2, 1.6] },
	{ name: 'Windows, rear', kind: 'window', area: 6, u: [1.4, 1.2] },
	{ name: 'Front door', kind: 'door', area: 1.9, u: [1.6, 1.8, 1.4] }
];
/** Thickness steps added to the first insulation layer of a build-up (mm). */
const STEPS = [0, 10, 20, 30, 40, 50, 60, 80];
const BIG_ARRAYS = new Set(['profile', 'months', 'massBalance', 'vapourProfile', 'nodes']);

/** The result without its per-month and per-node arrays, every figure kept. */
function trimmed(r: Record<string, unknown>): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const [k, v] of Object.entries(r)) {
		if (BIG_ARRAYS.has(k)) out[k] = Array.isArray(v) ? [] : v && typeof v === 'object' ? {} : v;
		else if ((k === 'condensation' || k === 'surface') && v && typeof v === 'object')
			out[k] = trimmed(v as Record<string, unknown>);
		else out[k] = v;
	}
	return out;
}

function variants(setup: Awaited<ReturnType<typeof setupOrganisation>>) {
	const { byCode, climate, limits, demoElements } = setup;
	const demo = new Map(demoElements.map((e) => [e.name as string, e]));
	const out: Variant[] = [];
	const full = new Map<string, unknown>();
	// as the report's snapshot has it (src/lib/server/reports/snapshot.ts)
	const snap = (
		x: Omit<Variant, 'slot' | 'variant' | 'snap'>,
		input: unknown,
		u: number,
		revisions: unknown[]
	) => {
		const limit = limits[x.kind] ?? null;
		return {
			name: x.name,
			kind: x.kind,
			area: x.area,
			heatFlow: x.heat_flow,
			givenU: x.given_u,
			givenUSource: x.given_u_source,
			buildUp: x.build_up,
			internal: x.internal,
			climate,
			input,
			result: x.result,
			u,
			limit,
			pass: limit === null ? null : u <= limit,
			materialRevisions: revisions
		};
	};
	SLOTS.forEach((slot, s) => {
		let v = 0;
		for (const name of slot.names) {
			const e = demo.get(name);
			if (!e) throw new Error(`demo element “${name}” missing: is seed 04 in place?`);
			const layers0: StoredLayer[] = (e.build_up.layers as StoredLayer[]).map((l) => {
				const m = l.materialCode ? byCode.get(l.materialCode) : undefined;
				return m ? { ...l, materialId: m.materialId, materialRevisionId: m.revisionId } : { ...l };
			});
			const insulation = layers0.findIndex((l) => l.materialCode?.startsWith('G-INS'));
			for (const step of insulation < 0 ? [0] : STEPS) {
				const layers = layers0.map((l) => ({ ...l }));
				if (insulation >= 0) layers[insulation].thicknessMm += step;
				const buildUp = { ...e.build_up, layers } as StoredBuildUp;
				const input = toElementInput(
					{ heatFlow: e.heat_flow, buildUp, internal: e.internal, area: slot.area },
					climate.months
				);
				const result = analyseElement(input) as unknown as Record<string, unknown>;
				full.set(`${s}:${v}`, result);
				const row = {
					name: (slot.prefix ?? '') + name,
					kind: e.kind,
					area: slot.area,
					heat_flow: e.heat_flow,
					build_up: buildUp,
					internal: e.internal,
					given_u: null,
					given_u_source: null,
					result: trimmed(result)
				};
				const revisions = layers.flatMap((l, i) =>
					l.materialId
						? [
								{
									layerIndex: i,
									materialId: l.materialId,
									revisionId: l.materialRevisionId,
									revision: 1,
									code: l.materialCode ?? null
								}
							]
						: []
				);
				out.push({
					slot: s,
					variant: v++,
					...row,
					snap: snap(row, input, result.uValueRounded as number, revisions)
				});
			}
		}
	});
	GIVEN.forEach((g, i) => {
		g.u.forEach((u, v) => {
			const row = {
				name: g.name,
				kind: g.kind,
				area: g.area,
				heat_flow: 'horizontal',
				build_up: null,
				internal: null,
				given_u: u,
				given_u_source: 'Manufacturer’s declaration (invented for the benchmark)',
				result: null
			};
			out.push({ slot: SLOTS.length + i, variant: v, ...row, snap: snap(row, null, u, []) });
		});
	});
	return { variants: out, full };
}

/* ------------------------------------------------------------------ generation in SQL */

// A v4-shaped uuid from a text key, so that every statement names the same rows without reading them back.
const uuidOf = (key: string) => `overlay(overlay(md5(${key}) placing '4' from 13) placing '8' from 17)::uuid`;
const dwellingId = (g: string) => uuidOf(`:org || ':d:' || ${g}`);
const elementId = (g: string, s: string) => uuidOf(`:org || ':e:' || ${g} || ':' || ${s}`);
/** 0 … n-1, fixed per dwelling and salt. */
const pick = (salt: string, g: string, n: number | string) => `(abs(hashtext('${salt}:' || ${g})) % ${n})`;
const createdAt = (g: string) =>
	`(now() - make_interval(secs => ${pick('created', g, 730 * 86400)} + 30 * 86400))`;
const STREETS = [
	'Alder',
	'Birch',
	'Cedar',
	'Damson',
	'Elder',
	'Fir',
	'Gorse',
	'Hazel',
	'Ivy',
	'Juniper',
	'Kestrel',
	'Linnet',
	'Maple',
	'Nightjar',
	'Osier',
	'Plover',
	'Quince',
	'Rowan',
	'Sorrel',
	'Teasel',
	'Umber',
	'Vetch',
	'Willow',
	'Yarrow',
	'Aspen',
	'Bramble',
	'Clover',
	'Dunlin',
	'Egret',
	'Fieldfare',
	'Goldcrest',
	'Heron',
	'Iris',
	'Jay',
	'Kingfisher',
	'Lapwing',
	'Merlin',
	'Nuthatch',
	'Oriel',
	'Pipit'
].map((s, i) => `${s} ${['Row', 'Lane', 'Terrace', 'Street', 'Close'][i % 5]}`);
const TOWNS = ['Larkfield', 'Northmoor', 'Ashby Vale', 'Quarrington', 'Sedgebrook', 'Wrenford'];
const PROGRAMMES = Array.from(
	{ length: 12 },
	(_, i) => `${TOWNS[i % TOWNS.length]} retrofit phase ${1 + Math.floor(i / TOWNS.length)} (invented)`
);
const CLIENTS = Array.from({ length: 8 }, (_, i) => `Housing cooperative ${i + 1} (invented)`);
const sqlArray = (xs: string[]) => `ARRAY[${xs.map((x) => `'${x.replace(/'/g, "''")}'`).join(', ')}]`;

/**
 * Status by dwelling number: every tenth dwelling (up to the batch) is awaiting review, and the rest are
 * drafts (half), issued, accepted, changed after acceptance, returned or archived.
 */
const statusOf = (
	g: string
) => `CASE WHEN ${g} % 10 = 3 AND ${g} <= ${RECOMPUTE * 10} THEN 'awaiting-review' ELSE (
	CASE WHEN ${pick('status', g, 100)} < 50 THEN 'draft'
		WHEN ${pick('status', g, 100)} < 72 THEN 'issued'
		WHEN ${pick('status', g, 100)} < 88 THEN 'accepted'
		WHEN ${pick('status', g, 100)} < 90 THEN 'changed-after-acceptance'
		WHEN ${pick('status', g, 100)} < 93 THEN 'returned'
		ELSE 'archived' END) END`;

const VARIANTS_CTE = `v AS (
	SELECT * FROM jsonb_to_recordset(:variants::jsonb) AS x(slot int, variant int, name text, kind text,
		area float8, heat_flow text, build_up jsonb, internal jsonb, given_u float8, given_u_source text,
		result jsonb, snap jsonb)),
	n AS (SELECT slot, count(*)::int AS n FROM v GROUP BY slot)`;
/** The variant of slot n.slot that dwelling g has. */
const variantJoin = (g: string) =>
	`JOIN v ON v.slot = n.slot AND v.variant = abs(hashtext('v' || n.slot || ':' || ${g})) % n.n`;

async function generate(setup: Awaited<ReturnType<typeof setupOrganisation>>, vs: Variant[]) {
	const params = {
		org: orgId,
		n: DWELLINGS,
		climate: setup.climate.id,
		engine: ENGINE_VERSION,
		limitTable: JSON.stringify(setup.limitTable),
		variants: JSON.stringify(vs)
	};
	const steps: [string, number][] = [];
	await db.transaction(async (trx) => {
		let t = performance.now();
		const assessorIds = sqlArray(assessors.map((a) => a.id));
		await trx.raw(
			`INSERT INTO dwellings (id, organisation_id, reference, address, programme, client_name, client_email,
				assessor_id, stage, status, climate_id, created_at, updated_at, issue_changes)
			SELECT id, :org, 'SC-' || lpad(g::text, 6, '0'),
				(1 + ${pick('no', 'g', 240)}) || ' ' || (${sqlArray(STREETS)})[1 + g % ${STREETS.length}] || ', '
					|| (${sqlArray(TOWNS)})[1 + ${pick('town', 'g', TOWNS.length)}] || ' (invented)',
				(${sqlArray(PROGRAMMES)})[1 + ${pick('prog', 'g', PROGRAMMES.length)}],
				(${sqlArray(CLIENTS)})[1 + ${pick('client', 'g', CLIENTS.length)}],
				'programme' || (1 + ${pick('client', 'g', CLIENTS.length)}) || '@housing-coop.example.test',
				CASE WHEN status = 'draft' AND ${pick('unassigned', 'g', 25)} = 0 THEN NULL
					ELSE (${assessorIds}::uuid[])[1 + ${pick('assessor', 'g', assessors.length)}] END,
				CASE WHEN ${pick('stage', 'g', 4)} = 0 THEN 'as-built' ELSE 'design' END,
				status, :climate, created,
				created + make_interval(secs => ${pick('updated', 'g', 30 * 86400)}),
				CASE WHEN status = 'draft' THEN NULL WHEN status = 'changed-after-acceptance' THEN 1 ELSE 0 END
			FROM (SELECT g, ${dwellingId('g')} AS id, ${statusOf('g')} AS status, ${createdAt('g')} AS created
				FROM generate_series(1, :n) g) x`,
			params
		);
		steps.push([`${DWELLINGS} dwellings`, seconds(t)]);
		// Values no measurement reads (the elements' trimmed results, reports other than those of the batch
		// and of issued dwellings) are compressed with lz4, several times faster to write than the default
		// pglz; everything measured is read as the app stores it. Without lz4 in the server, pglz throughout.
		const lz4 = await trx
			.transaction((sp) => sp.raw(`SET LOCAL default_toast_compression = 'lz4'`))
			.then(
				() => true,
				() => false
			);
		t = performance.now();
		await trx.raw(
			`WITH ${VARIANTS_CTE}
			INSERT INTO elements (id, organisation_id, dwelling_id, position, name, kind, area, heat_flow,
				build_up, given_u, given_u_source, internal, last_result, engine_version, created_at, updated_at)
			SELECT ${elementId('g', 'n.slot')}, :org, ${dwellingId('g')}, n.slot, v.name, v.kind, v.area, v.heat_flow,
				v.build_up, v.given_u, v.given_u_source, v.internal, v.result,
				CASE WHEN v.result IS NULL THEN NULL ELSE :engine END, ${createdAt('g')}, ${createdAt('g')}
			FROM generate_series(1, :n) g CROSS JOIN n ${variantJoin('g')}`,
			params
		);
		steps.push([`${DWELLINGS * 8} elements`, seconds(t)]);
		t = performance.now();
		// One issued dwelling report per dwelling that is not a draft, its snapshot as the audit reads it.
		const insertReports = (statuses: string) =>
			trx.raw(
				`WITH ${VARIANTS_CTE},
			d AS (SELECT id, reference, address, programme, stage, client_name, client_email, assessor_id,
					substr(reference, 4)::int AS g, updated_at
				FROM dwellings WHERE organisation_id = :org AND ${statuses}),
			r AS (SELECT d.*, 'R-' || d.reference AS number,
					md5(:org || ':r:' || d.id) AS code,
					convert_to('%PDF-1.4 placeholder for ' || d.reference, 'UTF8') AS pdf
				FROM d)
			INSERT INTO reports (organisation_id, number, revision, scope, dwelling_id, snapshot, engine_version,
				verification_code, sha256, pdf, issued_by, issued_at)
			SELECT :org, r.number, 1, 'dwelling', r.id,
				jsonb_build_object(
					'dwelling', jsonb_build_object('id', r.id, 'reference', r.reference, 'address', r.address,
						'programme', r.programme, 'stage', r.stage, 'clientName', r.client_name,
						'clientEmail', r.client_email),
					'organisation', jsonb_build_object('id', :org::uuid),
					'limitTable', :limitTable::jsonb,
					'elements', (SELECT jsonb_agg(v.snap || jsonb_build_object('id', ${elementId('r.g', 'n.slot')})
							ORDER BY n.slot)
						FROM n ${variantJoin('r.g')}),
					'junctions', '[]'::jsonb,
					'engineVersion', :engine::text,
					'issuedAt', r.updated_at,
					'document', jsonb_build_object('scope', 'dwelling', 'draft', false, 'number', r.number,
						'revision', 1, 'verificationCode', r.code)),
				:engine, r.code, encode(sha256(r.pdf), 'hex'), r.pdf,
				coalesce(r.assessor_id, (${assessorIds}::uuid[])[1]), r.updated_at
			FROM r`,
				params
			);
		const unread = await insertReports(`status NOT IN ('draft', 'awaiting-review', 'issued')`);
		if (lz4) await trx.raw('SET LOCAL default_toast_compression TO DEFAULT');
		const read = await insertReports(`status IN ('awaiting-review', 'issued')`);
		const reports = unread.rowCount + read.rowCount;
		steps.push([
			`${reports} issued dwelling reports (${read.rowCount} of them, the batch's and the issued dwellings', compressed as the app's)`,
			seconds(t)
		]);
		t = performance.now();
		const [batch] = (
			await trx.raw(
				`INSERT INTO audit_batches (organisation_id, name, filter, sampling, seed, created_by)
				SELECT :org, 'Scale bench batch', jsonb_build_object('source', 'filter', 'population',
						(SELECT jsonb_agg(id::text ORDER BY id) FROM dwellings
							WHERE organisation_id = :org AND status = 'awaiting-review')),
					'{"rule": "all", "includeFlagged": true}', 'scale', :supervisor
				RETURNING id`,
				{ org: orgId, supervisor: supervisor.id }
			)
		).rows;
		await trx.raw(
			`INSERT INTO audit_items (organisation_id, batch_id, dwelling_id, picked_because)
			SELECT :org, :batch, id, 'all dwellings of the batch' FROM dwellings
			WHERE organisation_id = :org AND status = 'awaiting-review'`,
			{ org: orgId, batch: batch.id }
		);
		steps.push([`audit batch of ${RECOMPUTE} dwellings`, seconds(t)]);
		generated.batchId = batch.id;
	});
	return steps;
}
const generated = { batchId: '' };

/**
 * Autovacuum analyses the new rows (the plans are only realistic after it) and vacuums them (the
 * visibility map that index-only scans use). Waits for both, at most `limitS`; without the analysis the
 * figures would mean little, so it is said.
 */
async function waitForAutovacuum(since: Date, limitS = 150) {
	const t0 = performance.now();
	for (;;) {
		const { rows } = await db.raw(
			`SELECT relname, coalesce(last_autoanalyze > :since, false) AS analysed,
				coalesce(last_autovacuum > :since, false) AS vacuumed
			FROM pg_stat_user_tables WHERE relname IN ('dwellings', 'elements', 'reports')`,
			{ since }
		);
		const pending = (rows as { relname: string; analysed: boolean; vacuumed: boolean }[]).filter(
			(r) => !r.analysed || !r.vacuumed
		);
		if (!pending.length || seconds(t0) > limitS)
			return {
				waited: seconds(t0),
				pending: pending.map(
					(r) => `${r.relname} (${r.analysed ? 'analysed, not vacuumed' : 'NOT ANALYSED'})`
				)
			};
		await new Promise((r) => setTimeout(r, 2000));
	}
}

/* ------------------------------------------------------------------ HTTP */

const freePort = () =>
	new Promise<number>((resolve, reject) => {
		const s = createServer();
		s.listen(0, '127.0.0.1', () => {
			const port = (s.address() as { port: number }).port;
			s.close(() => resolve(port));
		});
		s.on('error', reject);
	});

type Route = { name: string; path: string; headers?: Record<string, string>; target?: boolean };
type Run = {
	name: string;
	rps: number;
	p50: number;
	p99: number;
	/** requests answered in all its rounds */
	answered: number;
	non2xx: number;
	target?: boolean;
};
type Result = Awaited<ReturnType<typeof autocannon>>;
/**
 * Medians over the rounds. A round in which no request came back within its seconds counts as a latency
 * of the whole round (the real one is longer), never as 0.
 */
function summary(name: string, rounds: Result[], target?: boolean): Run {
	const lat = (r: Result, p: 'p50' | 'p99') => (r.requests.total > 0 ? r.latency[p] : r.duration * 1000);
	return {
		name,
		rps: median(rounds.map((r) => r.requests.average)),
		p50: median(rounds.map((r) => lat(r, 'p50'))),
		p99: median(rounds.map((r) => lat(r, 'p99'))),
		answered: rounds.reduce((a, r) => a + r.requests.total, 0),
		non2xx: rounds.reduce((a, r) => a + r.non2xx + r.errors, 0),
		target
	};
}

/**
 * Wait (at most 30 s) until the server's queries have finished: requests still in flight when a round
 * ends go on in the server and would fall on the next route's round.
 */
async function settle(limitS = 30) {
	const t0 = performance.now();
	for (;;) {
		const { rows } = await db.raw(
			`SELECT count(*)::int AS n FROM pg_stat_activity
			WHERE datname = current_database() AND usename = current_user AND state <> 'idle'
				AND pid <> pg_backend_pid()`
		);
		if (rows[0].n === 0 || seconds(t0) > limitS) return;
		await new Promise((r) => setTimeout(r, 100));
	}
}
const median = (xs: number[]) => {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};

async function measureHttp(
	pages: Record<'issued' | 'draft', { id: string; reference: string }>,
	street: string
) {
	const member = assessors[0];
	const token = randomBytes(24).toString('hex');
	await db('sessions').insert({
		userId: member.id,
		sessionToken: token,
		expires: new Date(Date.now() + 3600_000)
	});
	const port = await freePort();
	const origin = `http://127.0.0.1:${port}`;
	const server = spawn('node', [BUILD], {
		env: {
			...process.env,
			DATABASE_URL: DB_URL,
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: origin,
			AUTH_SECRET: process.env.AUTH_SECRET ?? 'bench-secret',
			ENVELO_NO_WORKERS: '1'
		},
		stdio: ['ignore', 'ignore', 'ignore']
	});
	process.on('exit', () => {
		if (server.exitCode === null && server.signalCode === null) server.kill('SIGKILL');
	});
	for (let i = 0; ; i++) {
		try {
			if ((await fetch(`${origin}/healthz`)).ok) break;
		} catch {
			/* not up yet */
		}
		if (i > 100) throw new Error('server did not start');
		await new Promise((r) => setTimeout(r, 200));
	}
	const cookie = `authjs.session-token=${token}`;
	const q = encodeURIComponent(street);
	const routes: Route[] = [
		{ name: 'GET /healthz (floor)', path: '/healthz' },
		{ name: `list: search “${street}”`, path: `/dwellings?q=${q}`, headers: { cookie }, target: true },
		{ name: 'list: status returned', path: '/dwellings?status=returned', headers: { cookie }, target: true },
		{
			name: 'list: sort by address',
			path: '/dwellings?sort=address&dir=asc',
			headers: { cookie },
			target: true
		},
		{
			name: `list: page ${DEEP_PAGE}`,
			path: `/dwellings?page=${DEEP_PAGE}`,
			headers: { cookie },
			target: true
		},
		{
			name: `dwelling page, issued (${pages.issued.reference})`,
			path: `/dwellings/${pages.issued.id}`,
			headers: { cookie },
			target: true
		},
		{
			name: `dwelling page, draft (${pages.draft.reference})`,
			path: `/dwellings/${pages.draft.id}`,
			headers: { cookie },
			target: true
		}
	];
	const pageRoute = routes[routes.length - 2];
	// Each route answers once before it is measured: a 200 with the data, not an error page.
	for (const r of routes.slice(1)) {
		const res = await fetch(origin + r.path, { headers: r.headers });
		const html = await res.text();
		if (res.status !== 200) throw new Error(`${r.path} answered ${res.status}`);
		for (const d of Object.values(pages))
			if (r.path.endsWith(d.id) && !html.includes(d.reference))
				throw new Error(`${r.path} does not show ${d.reference}`);
		// the generated report is what issuing would have frozen: the page finds no change since issue
		if (r === pageRoute && html.includes('data-testid="changed-since-issue"'))
			throw new Error(`${r.path}: the generated report does not match its dwelling`);
	}
	const once = async (route: Route, connections = CONNECTIONS, duration = DURATION) => {
		const r = await autocannon({ url: origin + route.path, connections, duration, headers: route.headers });
		await settle();
		return r;
	};
	const results = routes.map(() => [] as Awaited<ReturnType<typeof once>>[]);
	for (let round = 0; round < ROUNDS; round++)
		for (let i = 0; i < routes.length; i++) results[i].push(await once(routes[i]));
	const runs: Run[] = routes.map((route, i) => summary(route.name, results[i], route.target));
	// The dwelling page under 20 connections and, at the same time, /healthz from 2 more (a monitor's probe).
	const [pageLoad, probe] = await Promise.all([
		once(pageRoute, CONNECTIONS, DURATION * ROUNDS),
		once(routes[0], 2, DURATION * ROUNDS)
	]);
	await db('sessions').where({ sessionToken: token }).delete();
	await new Promise<void>((resolve) => {
		if (server.exitCode !== null || server.signalCode !== null) return resolve();
		const kill = setTimeout(() => server.kill('SIGKILL'), 5000);
		server.once('exit', () => {
			clearTimeout(kill);
			resolve();
		});
		server.kill('SIGTERM');
	});
	return { runs, pageLoad, probe };
}

/* ------------------------------------------------------------------ main */

/** JSON with its keys sorted (jsonb keeps its own key order). */
const canonical = (x: unknown): string =>
	Array.isArray(x)
		? `[${x.map(canonical).join(',')}]`
		: x && typeof x === 'object'
			? `{${Object.keys(x)
					.sort()
					.map((k) => `${JSON.stringify(k)}:${canonical((x as Record<string, unknown>)[k])}`)
					.join(',')}}`
			: JSON.stringify(x);

async function main() {
	console.log(
		`${DWELLINGS} dwellings × 8 elements, recompute of ${RECOMPUTE}; load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores`
	);
	const t0 = performance.now();
	const startedAt = new Date();
	const setup = await setupOrganisation();
	const { variants: vs, full } = variants(setup);
	const prep = seconds(t0);
	const steps = await generate(setup, vs);
	const genTotal = seconds(t0);
	console.log(
		`generated in ${genTotal.toFixed(1)} s: organisation, ${people.length} members, library copy and ${vs.length} element variants computed with the engine ${prep.toFixed(1)} s; ${steps.map(([what, s]) => `${what} ${s.toFixed(1)} s`).join('; ')}`
	);

	// The dwellings whose page is measured, from the middle: an issued one (its page also compares the
	// dwelling with its latest report) and a draft; their elements' results stored whole, as the app does.
	const middle = `SC-${String(Math.floor(DWELLINGS / 2)).padStart(6, '0')}`;
	const measured = async (status: string) => {
		const d = await db('dwellings')
			.where({ organisation_id: orgId, status })
			.andWhere('reference', '>=', middle)
			.orderBy('reference')
			.first('id', 'reference');
		if (!d) throw new Error(`no ${status} dwelling to measure`);
		return d as { id: string; reference: string };
	};
	const pages = { issued: await measured('issued'), draft: await measured('draft') };
	await db.transaction(async (trx) => {
		const els = await trx('elements')
			.where({ organisation_id: orgId })
			.whereIn('dwelling_id', [pages.issued.id, pages.draft.id])
			.whereNotNull('last_result')
			.select('id', 'position', 'build_up');
		for (const e of els) {
			const v = vs.find((x) => x.slot === e.position && canonical(x.build_up) === canonical(e.build_up));
			if (!v) throw new Error(`no variant for element ${e.id}`);
			await trx('elements')
				.where({ id: e.id })
				.update({ last_result: JSON.stringify(full.get(`${v.slot}:${v.variant}`)) });
		}
	});
	const av = await waitForAutovacuum(startedAt);
	console.log(
		`waited ${av.waited.toFixed(0)} s for autovacuum to analyse and vacuum dwellings, elements and reports${av.pending.length ? ` (gave up on: ${av.pending.join(', ')})` : ''}`
	);

	const street = STREETS[7];
	const { runs, pageLoad, probe } = await measureHttp(pages, street);
	const floor = runs[0];
	console.log(
		`\n${CONNECTIONS} connections, ${ROUNDS} interleaved rounds of ${DURATION} s per route (medians), loopback, one server; load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores (the client shares them)`
	);
	const line = (r: Run) =>
		`${r.name.padEnd(38)} ${r.rps.toFixed(1).padStart(7)} req/s   p50 ${String(r.p50).padStart(5)} ms   p99 ${String(r.p99).padStart(5)} ms   ×${(r.rps / floor.rps).toFixed(3)} of the floor   (${r.answered} answered)` +
		(r.target ? `   p99 target < ${TARGET_P99_MS} ms: ${r.p99 < TARGET_P99_MS ? 'meets' : 'misses'}` : '') +
		(r.non2xx ? `   non-2xx/errors ${r.non2xx}` : '');
	for (const r of runs) console.log(line(r));
	const pl = summary('dwelling page, issued, probed', [pageLoad], true);
	console.log(
		`${DURATION * ROUNDS} s of the dwelling page (20 connections) with /healthz probed alongside (2 connections):`
	);
	console.log(line(pl));
	console.log(
		`${'GET /healthz alongside'.padEnd(38)} ${probe.requests.average.toFixed(0).padStart(6)} req/s   p50 ${String(probe.latency.p50).padStart(4)} ms   p99 ${String(probe.latency.p99).padStart(4)} ms   (floor alone: p50 ${floor.p50} ms, p99 ${floor.p99} ms)${probe.non2xx + probe.errors ? `   non-2xx/errors ${probe.non2xx + probe.errors}` : ''}`
	);

	// The recompute, after the HTTP rounds so that its writes do not fall on them.
	const population: string[] = (await db('audit_batches').where({ id: generated.batchId }).first('filter'))
		.filter.population;
	const f0 = performance.now();
	for (let i = 0; i < population.length; i += 200)
		await loadDwellingRows(db, orgId, population.slice(i, i + 200));
	const floorS = seconds(f0);
	const r0 = performance.now();
	await recomputeBatchWith(db, orgId, generated.batchId, { chunkSize: 200 });
	const wall = seconds(r0);
	const progress = (await db('audit_batches').where({ id: generated.batchId }).first('progress')).progress;
	if (progress.state !== 'done' || progress.done !== population.length)
		throw new Error(`recompute did not finish: ${JSON.stringify(progress)}`);
	console.log(
		`\nread-only floor: ${population.length} dwellings' rows (same queries, chunks of 200) in ${floorS.toFixed(2)} s, ${(population.length / floorS).toFixed(0)} dwellings/s`
	);
	console.log(
		`audit recompute: ${progress.done} dwellings (${progress.done * 8} elements, ${progress.flagged} flagged) in ${wall.toFixed(2)} s, ${(population.length / wall).toFixed(0)} dwellings/s, ×${(floorS / wall).toFixed(2)} of the floor's rate (recompute takes ${(wall / floorS).toFixed(2)}× the read)`
	);
	console.log(`whole bench: ${seconds(t0).toFixed(0)} s`);
	await db.destroy();
	process.exit(0);
}

main().catch(async (e) => {
	console.error(e);
	await db.destroy();
	process.exit(1);
});
