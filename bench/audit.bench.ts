// Recompute of an audit batch: 1,000 dwellings × 8 elements (6 build-ups, a window and a door), each with
// an issued report, generated into BENCH_DATABASE_URL (npm run bench starts a throwaway one). Prints the
// wall time and peak memory of the recompute beside the time to read the same rows from PostgreSQL alone.
// Targets: under 10 s, and within 3× of the read-only floor. Invented data, for the benchmark only.
import knex from 'knex';
import { randomUUID, randomBytes, createHash } from 'node:crypto';
import { analyseElement, ENGINE_VERSION } from '../src/lib/physics';
import { toElementInput, type StoredLayer } from '../src/lib/dwellings/element-input';
import { loadDwellingRows, recomputeBatchWith } from '../src/lib/server/audit/recompute';

const url = process.env.BENCH_DATABASE_URL;
if (!url) {
	console.log('audit bench: BENCH_DATABASE_URL is not set (run `npm run bench -- audit`); skipped');
	process.exit(0);
}
const DWELLINGS = 1000;
const db = knex({ client: 'pg', connection: url, pool: { min: 0, max: 4 } });
const months = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
}));

async function setup() {
	const orgId = randomUUID();
	const userId = randomUUID();
	await db('organisations').insert({ id: orgId, name: `Bench ${orgId.slice(0, 6)}`, slug: `bench-${orgId}` });
	await db('users').insert({
		id: userId,
		email: `bench-${userId.slice(0, 8)}@example.test`,
		name: 'Bench assessor'
	});
	await db('memberships').insert({ organisation_id: orgId, user_id: userId, role: 'supervisor' });
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
			'flat-roof': 0.2,
			window: 1.6,
			door: 1.8
		})
	});
	const mats: Record<
		string,
		{ materialId: string; revisionId: string; code: string; lambda: number; mu: number }
	> = {};
	const specs: [string, string, number, number][] = [
		['plaster', 'plasters-linings', 0.4, 10],
		['block', 'masonry', 0.15, 10],
		['wool', 'insulation', 0.035, 1],
		['pir', 'insulation', 0.022, 60],
		['brick', 'masonry', 0.77, 10],
		['board', 'plasters-linings', 0.21, 4],
		['screed', 'concrete', 1.15, 30],
		['slab', 'concrete', 2.0, 80]
	];
	for (const [code, category, lambda, mu] of specs) {
		const materialId = randomUUID();
		const revisionId = randomUUID();
		await db.transaction(async (trx) => {
			await trx('materials').insert({ id: materialId, organisation_id: orgId, code: `B-${code}` });
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
			await trx('materials').where({ id: materialId }).update({ current_revision_id: revisionId });
		});
		mats[code] = { materialId, revisionId, code: `B-${code}`, lambda, mu };
	}
	const L = (code: string, t: number, extra: Partial<StoredLayer> = {}): StoredLayer => ({
		name: code,
		thicknessMm: t,
		lambda: mats[code].lambda,
		mu: mats[code].mu,
		materialId: mats[code].materialId,
		materialRevisionId: mats[code].revisionId,
		materialCode: mats[code].code,
		...extra
	});
	const buildUps: { kind: string; heatFlow: string; layers: StoredLayer[] }[] = [
		{
			kind: 'external-wall',
			heatFlow: 'horizontal',
			layers: [L('plaster', 13), L('block', 100), L('pir', 90), L('brick', 102)]
		},
		{
			kind: 'external-wall',
			heatFlow: 'horizontal',
			layers: [
				L('board', 12.5),
				L('wool', 140, { name: 'wool between studs', bridge: { lambda: 0.13, fraction: 0.15 } }),
				L('brick', 102)
			]
		},
		{
			kind: 'pitched-roof-ceiling',
			heatFlow: 'upward',
			layers: [
				L('board', 12.5),
				L('wool', 100, { name: 'wool between joists', bridge: { lambda: 0.13, fraction: 0.1 } }),
				L('wool', 200)
			]
		},
		{ kind: 'ground-floor', heatFlow: 'downward', layers: [L('screed', 65), L('pir', 100), L('slab', 150)] },
		{ kind: 'flat-roof', heatFlow: 'upward', layers: [L('board', 12.5), L('slab', 150), L('pir', 120)] },
		{
			kind: 'external-wall',
			heatFlow: 'horizontal',
			layers: [L('plaster', 13), L('brick', 215), L('wool', 100), L('brick', 102)]
		}
	];
	const results = new Map<string, { input: unknown; result: unknown }>();
	const resultFor = (b: (typeof buildUps)[number]) => {
		const key = JSON.stringify(b);
		let hit = results.get(key);
		if (!hit) {
			const input = toElementInput(
				{
					heatFlow: b.heatFlow as 'horizontal',
					buildUp: { layers: b.layers },
					internal: { temperature: 20, humidityClass: 3 }
				},
				months
			);
			const r = analyseElement(input);
			// the stored result without the per-month Glaser detail and the profile, to keep the fixture small
			hit = {
				input,
				result: {
					...r,
					profile: [],
					condensation: r.condensation ? { ...r.condensation, months: [] } : undefined
				}
			};
			results.set(key, hit);
		}
		return hit;
	};
	const varied = (b: (typeof buildUps)[number], k: number) => {
		const layers = b.layers.map((l) => ({ ...l }));
		const j = layers.findIndex((l) => l.name.startsWith('wool') || l.name.startsWith('pir'));
		layers[j].thicknessMm += 5 * k;
		return { ...b, layers };
	};
	let dwellingIndex = 0;
	const population: string[] = [];
	for (let start = 0; start < DWELLINGS; start += 100) {
		await db.transaction(async (trx) => {
			const dRows = Array.from({ length: Math.min(100, DWELLINGS - start) }, (_, k) => ({
				id: randomUUID(),
				organisation_id: orgId,
				reference: `B-${start + k}`,
				address: 'Bench Row',
				assessor_id: userId,
				status: 'issued',
				climate_id: climate.id,
				programme: 'bench'
			}));
			await trx('dwellings').insert(dRows);
			const eRows: Record<string, unknown>[] = [];
			const reports: Record<string, unknown>[] = [];
			for (const d of dRows) {
				population.push(d.id);
				const snapElements: unknown[] = [];
				const n = dwellingIndex++;
				buildUps.forEach((b0, p) => {
					// vary the thickness of one layer by dwelling (40 variants per build-up), so repeated
					// inputs are no more common than on a real programme built from a few templates
					const b = varied(b0, n % 40);
					const id = randomUUID();
					eRows.push({
						id,
						organisation_id: orgId,
						dwelling_id: d.id,
						position: p,
						name: `${b.kind} ${p}`,
						kind: b.kind,
						area: 20,
						heat_flow: b.heatFlow,
						build_up: JSON.stringify({ layers: b.layers }),
						internal: JSON.stringify({ temperature: 20, humidityClass: 3 })
					});
					snapElements.push({
						id,
						name: `${b.kind} ${p}`,
						kind: b.kind,
						area: 20,
						heatFlow: b.heatFlow,
						buildUp: { layers: b.layers },
						internal: { temperature: 20, humidityClass: 3 },
						climate: { id: climate.id, months },
						input: resultFor(b).input,
						result: resultFor(b).result,
						limit: null,
						pass: null,
						materialRevisions: b.layers.map((l, i) => ({
							layerIndex: i,
							materialId: l.materialId,
							revisionId: l.materialRevisionId,
							revision: 1
						}))
					});
				});
				for (const [p, kind, u] of [
					[6, 'window', 1.4],
					[7, 'door', 1.6]
				] as const) {
					const id = randomUUID();
					eRows.push({
						id,
						organisation_id: orgId,
						dwelling_id: d.id,
						position: p,
						name: kind,
						kind,
						area: 2,
						heat_flow: 'horizontal',
						given_u: u,
						given_u_source: 'certificate'
					});
					snapElements.push({
						id,
						name: kind,
						kind,
						area: 2,
						heatFlow: 'horizontal',
						givenU: u,
						buildUp: null,
						internal: null,
						climate: null,
						input: null,
						result: null,
						limit: null,
						pass: null,
						materialRevisions: []
					});
				}
				const pdf = Buffer.from(`%PDF bench ${d.reference}`);
				reports.push({
					organisation_id: orgId,
					number: `R-${d.reference}`,
					revision: 1,
					scope: 'dwelling',
					dwelling_id: d.id,
					snapshot: JSON.stringify({
						dwelling: { id: d.id },
						elements: snapElements,
						engineVersion: ENGINE_VERSION
					}),
					engine_version: ENGINE_VERSION,
					verification_code: randomBytes(8).toString('hex'),
					sha256: createHash('sha256').update(pdf).digest('hex'),
					pdf,
					issued_by: userId
				});
			}
			await trx('elements').insert(eRows);
			await trx('reports').insert(reports);
		});
	}
	const [batch] = await db('audit_batches')
		.insert({
			organisation_id: orgId,
			name: 'Bench batch',
			filter: JSON.stringify({ source: 'filter', population: population.slice().sort() }),
			sampling: JSON.stringify({ rule: 'all', includeFlagged: true }),
			seed: 'bench',
			created_by: userId
		})
		.returning('id');
	for (let i = 0; i < population.length; i += 500) {
		await db('audit_items').insert(
			population.slice(i, i + 500).map((id) => ({
				organisation_id: orgId,
				batch_id: batch.id,
				dwelling_id: id,
				picked_because: 'all dwellings of the batch'
			}))
		);
	}
	return { orgId, batchId: batch.id as string, population: population.slice().sort() };
}

const mb = (b: number) => (b / 1024 / 1024).toFixed(0);

async function main() {
	const t0 = performance.now();
	const { orgId, batchId, population } = await setup();
	console.log(
		`generated ${DWELLINGS} dwellings × 8 elements with issued reports in ${((performance.now() - t0) / 1000).toFixed(1)} s`
	);

	// floor: the same rows, read with the same queries and chunks, nothing computed
	const f0 = performance.now();
	for (let i = 0; i < population.length; i += 200)
		await loadDwellingRows(db, orgId, population.slice(i, i + 200));
	const floor = (performance.now() - f0) / 1000;

	global.gc?.();
	const base = process.memoryUsage();
	let peakRss = base.rss;
	let peakHeap = base.heapUsed;
	const timer = setInterval(() => {
		const m = process.memoryUsage();
		peakRss = Math.max(peakRss, m.rss);
		peakHeap = Math.max(peakHeap, m.heapUsed);
	}, 20);
	const r0 = performance.now();
	await recomputeBatchWith(db, orgId, batchId, { chunkSize: 200 });
	const wall = (performance.now() - r0) / 1000;
	clearInterval(timer);
	const progress = (await db('audit_batches').where({ id: batchId }).first('progress')).progress;
	const flagged = await db('audit_items')
		.where({ batch_id: batchId })
		.whereRaw('jsonb_array_length(flags) > 0')
		.count('* as n')
		.first();

	const byCode = await db.raw(
		`select f->>'code' as code, count(*) as n from audit_items, jsonb_array_elements(flags) f where batch_id = ? group by 1 order by 1`,
		[batchId]
	);
	console.log(
		`flags raised: ${byCode.rows.map((r: { code: string; n: number }) => `${r.code} ${r.n}`).join(', ')}`
	);
	console.log(
		'distinct element inputs: 240 (6 build-ups × 40 thicknesses); identical inputs within a chunk of 200 dwellings are calculated once'
	);
	console.log(`read-only floor (same rows, same queries): ${floor.toFixed(2)} s`);
	console.log(
		`recompute ${progress.done}/${progress.total} dwellings (${progress.total * 8} elements, ${flagged?.n} flagged): ${wall.toFixed(2)} s   target < 10 s   ${wall < 10 ? 'PASS' : 'FAIL'}`
	);
	console.log(
		`ratio recompute / floor: ${(wall / floor).toFixed(2)}×   target ≤ 3×   ${wall / floor <= 3 ? 'PASS' : 'FAIL'}`
	);
	console.log(
		`peak memory during the recompute: rss ${mb(peakRss)} MB (baseline ${mb(base.rss)} MB), heap ${mb(peakHeap)} MB (baseline ${mb(base.heapUsed)} MB)`
	);
	await db.destroy();
}

main().catch(async (e) => {
	console.error(e);
	await db.destroy();
	process.exit(1);
});
