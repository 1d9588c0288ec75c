import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, makeMember, tdb, fakeEvent } from '../../factories';
import { sampleDwellings, seededShuffle } from '../../../src/lib/audit/sampling';
import { auditDwelling, type DwellingBundle, type RevisionInfo } from '../../../src/lib/audit/assess';
import { analyseElement } from '../../../src/lib/physics';
import { toElementInput } from '../../../src/lib/dwellings/element-input';
import { parseReferenceText } from '../../../src/lib/server/audit/references';
import { AppError } from '../../../src/lib/server/errors';

// The audit's own rules (sampling, flags, decisions, the log) are common practice, no source; physical
// thresholds name their source beside the check.

describe('sampling', () => {
	const population = Array.from({ length: 40 }, (_, i) => ({
		id: `00000000-0000-4000-8000-${String(i).padStart(12, '0')}`,
		assessorId: i < 36 ? 'a' : 'b', // assessor b has only 4 of the 40
		assessorName: i < 36 ? 'A' : 'B'
	}));
	const rule = { rule: 'random' as const, percent: 10, minimumPerAssessor: 2, includeFlagged: true };

	it('reproduces with its seed, whatever order the rows come in', () => {
		const one = sampleDwellings(population, rule, 'seed-1');
		const two = sampleDwellings(population.slice().reverse(), rule, 'seed-1');
		expect(two).toEqual(one);
		const other = sampleDwellings(population, rule, 'seed-2');
		expect(other.map((p) => p.id)).not.toEqual(one.map((p) => p.id));
		// a seeded shuffle is a permutation
		expect(seededShuffle([1, 2, 3, 4, 5], 'x').sort()).toEqual([1, 2, 3, 4, 5]);
	});

	it('takes ceil(percent) at random and tops every assessor up to the minimum, saying why', () => {
		for (const seed of ['s1', 's2', 's3', 's4', 's5']) {
			const picks = sampleDwellings(population, rule, seed);
			const ids = new Set(picks.map((p) => p.id));
			const perB = population.filter((c) => c.assessorId === 'b' && ids.has(c.id)).length;
			const perA = population.filter((c) => c.assessorId === 'a' && ids.has(c.id)).length;
			expect(perA).toBeGreaterThanOrEqual(2);
			expect(perB).toBeGreaterThanOrEqual(2);
			expect(picks.filter((p) => p.reason.startsWith('random sample')).length).toBe(4); // ceil(10 % of 40)
			expect(picks.every((p) => p.reason.includes(`seed ${seed}`))).toBe(true);
		}
		expect(sampleDwellings(population, { rule: 'all', includeFlagged: false }, 'x')).toHaveLength(40);
	});

	it('a minimum larger than an assessor has takes all of theirs', () => {
		const picks = sampleDwellings(population, { ...rule, percent: 1, minimumPerAssessor: 10 }, 'z');
		const ids = new Set(picks.map((p) => p.id));
		expect(population.filter((c) => c.assessorId === 'b' && ids.has(c.id))).toHaveLength(4);
	});
});

describe('reference lists', () => {
	it('reads one reference per line or a "reference" column, with line numbers for problems', () => {
		expect(parseReferenceText('NRP-001\nNRP-002\n\nNRP-003\n').lines.map((l) => l.line)).toEqual([1, 2, 4]);
		const wide = parseReferenceText('address;Reference\n1 Row;NRP-001\n2 Row;\n');
		expect(wide.lines).toEqual([{ line: 2, reference: 'NRP-001' }]);
		expect(wide.issues[0].message).toMatch(/line 3: the reference is empty/);
		expect(parseReferenceText('a,b\n1,2\n').issues[0].message).toMatch(/headed "reference"/);
	});
});

/* ---------------------------------------------------------------- flags on constructed cases */

const MONTHS = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
}));

function rev(id: string, over: Partial<RevisionInfo> = {}): RevisionInfo {
	return {
		id,
		materialId: `m-${id}`,
		code: id.toUpperCase(),
		revision: 1,
		name: id,
		category: 'masonry',
		lambda: 0.77,
		lambdaKind: 'declared',
		resistance: null,
		muDry: 10,
		sd: null,
		thicknessMinMm: null,
		thicknessMaxMm: null,
		status: 'verified',
		...over
	};
}

/** A clean wall: plaster, block, PIR, brick; every layer linked to a verified, current revision. */
function cleanBundle(): DwellingBundle {
	const revs = [
		rev('plaster', { category: 'plasters-linings', lambda: 0.4 }),
		rev('block', { lambda: 0.15 }),
		rev('pir', { category: 'insulation', lambda: 0.022, muDry: 60 }),
		rev('brick', { lambda: 0.77 })
	];
	const thick = [13, 100, 100, 102];
	const layers = revs.map((r, i) => ({
		name: r.name,
		thicknessMm: thick[i],
		lambda: r.lambda!,
		mu: r.muDry!,
		materialId: r.materialId,
		materialRevisionId: r.id,
		materialCode: r.code!
	}));
	const element = {
		id: 'e1',
		name: 'Front wall',
		kind: 'external-wall' as const,
		area: 20,
		heatFlow: 'horizontal' as const,
		buildUp: { layers },
		givenU: null,
		givenUSource: null,
		internal: { temperature: 20, humidityClass: 3 as const },
		climateId: 'c1'
	};
	const input = toElementInput(element, MONTHS);
	const result = analyseElement(input);
	return {
		dwellingId: 'd1',
		climateId: 'c1',
		elements: [element],
		report: {
			id: 'r1',
			number: 'R-1',
			revision: 1,
			issuedAt: new Date().toISOString(),
			snapshot: {
				elements: [
					{
						...structuredClone(element),
						climate: { id: 'c1', months: MONTHS },
						input,
						result,
						limit: 0.3,
						pass: true,
						materialRevisions: revs.map((r, i) => ({
							layerIndex: i,
							materialId: r.materialId,
							revisionId: r.id,
							revision: 1
						}))
					}
				]
			}
		},
		limitTable: { name: 'Test limits', edition: '1', limits: { 'external-wall': 0.3, window: 1.6 } },
		climates: new Map([['c1', MONTHS]]),
		revisions: new Map(revs.map((r) => [r.id, r])),
		currentRevisions: new Map(revs.map((r) => [r.materialId, r]))
	};
}

const codes = (b: DwellingBundle) => auditDwelling(b).flags.map((f) => f.code);

describe('flags', () => {
	it('a clean, issued, reproducible wall raises no flag', () => {
		const a = auditDwelling(cleanBundle());
		expect(a.flags).toEqual([]);
		expect(a.elements[0].used!.u).toBeCloseTo(a.elements[0].issued!.u, 6);
		expect(a.elements[0].used!.u).toBeLessThan(0.3);
	});

	it('not issued', () => {
		const b = cleanBundle();
		b.report = null;
		expect(codes(b)).toEqual(['not-issued']);
	});

	it('U over the limit', () => {
		const b = cleanBundle();
		b.limitTable!.limits['external-wall'] = 0.15;
		expect(codes(b)).toEqual(['u-over-limit']);
		// a given window U over its limit
		const w = cleanBundle();
		w.report = { ...w.report!, snapshot: { elements: [] } };
		w.elements = [
			{
				id: 'w1',
				name: 'Window',
				kind: 'window',
				area: 2,
				heatFlow: 'horizontal',
				buildUp: null,
				givenU: 2.8,
				givenUSource: 'test',
				internal: null,
				climateId: null
			}
		];
		w.report.snapshot.elements = [
			{ ...w.elements[0], climate: null, input: null, result: null, limit: 1.6, pass: false }
		];
		expect(codes(w)).toEqual(['u-over-limit']);
	});

	it('interstitial condensation that does not dry out, and surface mould risk', () => {
		// A vapour-open inside and a vapour-tight outside skin over fibrous insulation accumulates in a cold
		// climate (Glaser method, ISO 13788:2012, clause 6; the classic "cold side barrier" case, common practice).
		const b = cleanBundle();
		const el = b.elements[0];
		el.buildUp = {
			layers: [
				{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 4 },
				{ name: 'Mineral wool', thicknessMm: 150, lambda: 0.035, mu: 1 },
				{ name: 'Bitumen sheet outside', thicknessMm: 4, lambda: 0.23, sd: 200 }
			]
		};
		el.internal = { temperature: 20, humidityClass: 4 };
		b.report = null;
		const c = codes(b);
		expect(c).toContain('condensation-accumulates');
		// Surface mould: an uninsulated thin wall in the same climate falls below fRsi,min (ISO 13788:2012, 4.2).
		const s = cleanBundle();
		s.report = null;
		s.elements[0].buildUp = { layers: [{ name: 'Single brick', thicknessMm: 102, lambda: 0.77, mu: 10 }] };
		s.elements[0].internal = { temperature: 20, humidityClass: 4 };
		expect(codes(s)).toContain('surface-mould-risk');
	});

	it('λ outside the plausible range for the category (ISO 10456:2007, Table 3, from memory)', () => {
		const b = cleanBundle();
		const pir = b.revisions.get('pir')!;
		pir.lambda = 0.2; // a foam board cannot conduct like timber
		b.elements[0].buildUp!.layers[2].lambda = 0.2;
		b.report = null;
		expect(codes(b)).toContain('lambda-implausible');
	});

	it('unverified and superseded materials', () => {
		const b = cleanBundle();
		b.revisions.get('brick')!.status = 'unverified';
		expect(codes(b)).toEqual(['material-unverified']);
		const s = cleanBundle();
		const newer = rev('brick2', { materialId: 'm-brick', revision: 2, lambda: 0.77 });
		s.revisions.set('brick2', newer);
		s.currentRevisions.set('m-brick', newer);
		expect(codes(s)).toEqual(['material-superseded']);
	});

	it('framed construction without bridging', () => {
		const b = cleanBundle();
		b.elements[0].buildUp!.layers[2].name = 'Mineral wool between studs';
		b.report = null;
		expect(codes(b)).toContain('framed-without-bridging');
		// with the studs entered as a bridge, no such flag
		b.elements[0].buildUp!.layers[2].bridge = { lambda: 0.13, fraction: 0.15 };
		expect(codes(b)).not.toContain('framed-without-bridging');
		// a rafter roof with insulation and no bridged layer
		const r = cleanBundle();
		r.report = null;
		r.elements[0].kind = 'pitched-roof-rafters';
		r.elements[0].heatFlow = 'upward';
		expect(codes(r)).toContain('framed-without-bridging');
	});

	it('thickness implausible for the kind', () => {
		const b = cleanBundle();
		b.report = null;
		b.elements[0].buildUp!.layers = [{ name: 'Render', thicknessMm: 20, lambda: 0.8, mu: 10 }];
		expect(codes(b)).toContain('thickness-implausible');
	});

	it('generic λ where a declared value is expected', () => {
		const b = cleanBundle();
		b.revisions.get('pir')!.lambdaKind = 'table';
		expect(codes(b)).toEqual(['generic-lambda']);
	});

	it('issued numbers that do not reproduce with the revisions they used', () => {
		const b = cleanBundle();
		b.report!.snapshot.elements![0].result!.uValue += 0.02;
		expect(codes(b)).toEqual(['not-reproducing']);
	});

	it("a stale report: inputs changed after issue, with the library's current revisions compared too", () => {
		const b = cleanBundle();
		b.elements[0].buildUp!.layers[2].thicknessMm = 120;
		expect(codes(b)).toEqual(['stale-report']);
		const c = cleanBundle();
		const newer = rev('pir2', {
			materialId: 'm-pir',
			revision: 2,
			category: 'insulation',
			lambda: 0.026,
			muDry: 60
		});
		c.revisions.set('pir2', newer);
		c.currentRevisions.set('m-pir', newer);
		const a = auditDwelling(c);
		expect(a.flags.map((f) => f.code).sort()).toEqual(['library-changed', 'material-superseded']);
		expect(a.elements[0].current!.u).toBeGreaterThan(a.elements[0].used!.u);
	});
});

/* ---------------------------------------------------------------- against PostgreSQL */

describe.skipIf(!hasDatabase)('audit batches (PostgreSQL)', async () => {
	const audits = await import('../../../src/lib/server/audit');
	const f = await import('../../factories-audit');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});
	const memberOf = (m: {
		id: string;
		email: string;
		role: 'assessor' | 'supervisor' | 'admin';
		organisationId: string;
	}) => ({
		user: { id: m.id, email: m.email, name: m.role },
		organisationId: m.organisationId,
		organisationName: 'Test',
		role: m.role
	});

	async function programme() {
		const t = await makeTeam();
		const second = await makeMember(t.org.id, 'assessor');
		const climateId = await f.makeClimate(t.org.id);
		await f.makeLimitTable(t.org.id, { 'external-wall': 0.3 });
		const layers = await f.cleanWallLayers(t.org.id);
		const prog = `Prog ${t.org.id.slice(0, 6)}`;
		const dwellings = [];
		for (let i = 0; i < 6; i++) {
			const d = await f.makeDwelling(t.org.id, i < 3 ? t.assessor.id : second.id, {
				programme: prog,
				climateId,
				reference: `P-${t.org.id.slice(0, 4)}-${i}`
			});
			await f.makeElement(t.org.id, d.id, { layers });
			if (i !== 5)
				await f.issueReport(t.org.id, d.id, t.assessor.id, { tamperU: i === 4 ? 0.05 : undefined });
			dwellings.push(d);
		}
		return { ...t, second, prog, dwellings };
	}

	it('creates a batch from a filter, recomputes it and adds flagged dwellings with their reason', async () => {
		const p = await programme();
		const sup = memberOf(p.supervisor);
		const b = await audits.createBatch(sup, {
			name: 'Spring check',
			source: 'filter',
			filter: { programme: p.prog },
			sampling: { rule: 'random', percent: 10, minimumPerAssessor: 1, includeFlagged: true },
			seed: 'abc'
		});
		expect(b.population).toBe(6);
		expect(b.items).toBe(2); // ceil(10 % of 6) = 1, then one more to give each assessor one
		expect(await audits.recomputeBatch(p.org.id, b.id)).toBe(true);
		const batch = await audits.getBatch(p.org.id, b.id);
		expect(batch!.progress).toMatchObject({ state: 'done', done: 6, total: 6 });
		const items = await audits.listItems(p.org.id, b.id);
		const byRef = new Map(items.map((i) => [i.reference, i]));
		expect(byRef.get(p.dwellings[4].reference)!.flags.map((x) => x.code)).toContain('not-reproducing');
		expect(byRef.get(p.dwellings[5].reference)!.flags.map((x) => x.code)).toContain('not-issued');
		for (const it of items.filter((i) => i.pickedBecause.startsWith('carries'))) {
			expect(it.flags.length).toBeGreaterThan(0);
		}
		expect(items.some((i) => i.pickedBecause.startsWith('carries'))).toBe(true);
		// counted first, without a batch: the same population and sample, and nothing written
		const before = await tdb()('audit_batches').where({ organisation_id: p.org.id }).count('* as n').first();
		const preview = await audits.previewBatch(sup, {
			name: 'preview',
			source: 'filter',
			filter: { programme: p.prog },
			sampling: { rule: 'random', percent: 10, minimumPerAssessor: 1, includeFlagged: true },
			seed: 'abc'
		});
		expect(preview).toMatchObject({ population: 6, sample: 2, includeFlagged: true });
		expect(preview.assessors.reduce((n, a) => n + a.matching, 0)).toBe(6);
		expect(preview.assessors.every((a) => a.sampled === 1)).toBe(true);
		const after = await tdb()('audit_batches').where({ organisation_id: p.org.id }).count('* as n').first();
		expect(after).toEqual(before);
		// the same seed again picks the same sample
		const again = await audits.createBatch(sup, {
			name: 'Again',
			source: 'filter',
			filter: { programme: p.prog },
			sampling: { rule: 'random', percent: 10, minimumPerAssessor: 1, includeFlagged: false },
			seed: 'abc'
		});
		const firstRandom = items
			.filter((i) => !i.pickedBecause.startsWith('carries'))
			.map((i) => i.dwellingId)
			.sort();
		expect((await audits.listItems(p.org.id, again.id)).map((i) => i.dwellingId).sort()).toEqual(firstRandom);
		// every recompute is in the log
		const logged = await tdb()('activity_log').where({
			organisation_id: p.org.id,
			action: 'audit-recompute'
		});
		expect(logged.length).toBeGreaterThanOrEqual(items.length);
		// another organisation sees nothing of it
		const other = await makeTeam();
		expect(await audits.getBatch(other.org.id, b.id)).toBeNull();
		expect(await audits.getItem(other.org.id, items[0].id)).toBeNull();
	});

	it('refuses unknown references line by line and writes nothing', async () => {
		const p = await programme();
		const before = await tdb()('audit_batches').where({ organisation_id: p.org.id }).count('* as n').first();
		const err = await audits
			.createBatch(memberOf(p.supervisor), {
				name: 'By list',
				source: 'references',
				filter: {},
				referenceLines: [
					{ line: 2, reference: p.dwellings[0].reference },
					{ line: 3, reference: 'NOPE-1' },
					{ line: 4, reference: p.dwellings[0].reference }
				],
				sampling: { rule: 'all', includeFlagged: false }
			})
			.catch((e) => e);
		expect(err).toBeInstanceOf(AppError);
		expect(err.issues.map((i: { message: string }) => i.message)).toEqual([
			'line 3: no dwelling with the reference "NOPE-1" in this organisation',
			`line 4: "${p.dwellings[0].reference}" is listed twice (also on line 2)`
		]);
		const after = await tdb()('audit_batches').where({ organisation_id: p.org.id }).count('* as n').first();
		expect(after!.n).toBe(before!.n);
	});

	it('an assessor cannot decide, neither through the module nor the API', async () => {
		const p = await programme();
		const b = await audits.createBatch(memberOf(p.supervisor), {
			name: 'All',
			source: 'filter',
			filter: { programme: p.prog },
			sampling: { rule: 'all', includeFlagged: true }
		});
		const [item] = await audits.listItems(p.org.id, b.id);
		await expect(
			audits.decideItem(memberOf(p.assessor), item.id, { decision: 'accepted', comment: '' })
		).rejects.toMatchObject({ status: 403 });
		const { POST } = await import('../../../src/routes/api/v1/audit/items/[itemId=uuid]/decision/+server');
		const event = fakeEvent(p.assessor, `/api/v1/audit/items/${item.id}/decision`);
		const res = await (POST as any)({
			...event,
			params: { itemId: item.id },
			request: new Request('http://x', { method: 'POST', body: JSON.stringify({ decision: 'accepted' }) })
		}).catch((e: any) => e);
		expect(res.status).toBe(403);
		expect((await audits.getItem(p.org.id, item.id))!.decision).toBeNull();
	});

	it('a returned and resubmitted dwelling keeps both decisions in the log; log rows cannot be changed', async () => {
		const p = await programme();
		const sup = memberOf(p.supervisor);
		const d = p.dwellings[0];
		const b = await audits.createBatch(sup, {
			name: 'One',
			source: 'references',
			filter: {},
			references: [d.reference],
			sampling: { rule: 'all', includeFlagged: false }
		});
		await audits.recomputeBatch(p.org.id, b.id);
		const [item] = await audits.listItems(p.org.id, b.id);
		expect((await tdb()('dwellings').where({ id: d.id }).first()).status).toBe('awaiting-review');
		await audits.decideItem(sup, item.id, {
			decision: 'returned',
			comment: 'Check the brick λ against the product sheet.'
		});
		expect((await tdb()('dwellings').where({ id: d.id }).first()).status).toBe('returned');
		// the assessor's e-mail is queued in the same transaction (the outbox worker sends it)
		const mail = await tdb()('mail_outbox').where({ dwelling_id: d.id, purpose: 'audit-return' }).first();
		expect(mail.to_address).toBe(p.assessor.email);
		expect(mail.body_text).toContain('Check the brick λ against the product sheet.');
		// resubmitting before re-issuing is refused
		await expect(
			audits.resubmitItem(memberOf(p.assessor), item.id, { comment: 'done' })
		).rejects.toMatchObject({ status: 409 });
		// another assessor may not answer for this one
		await expect(audits.resubmitItem(memberOf(p.second), item.id, { comment: 'done' })).rejects.toMatchObject(
			{ status: 403 }
		);
		await f.issueReport(p.org.id, d.id, p.assessor.id, { issuedAt: new Date(Date.now() + 1000) });
		const after = await audits.resubmitItem(memberOf(p.assessor), item.id, {
			comment: 'Checked; re-issued.'
		});
		expect(after).toMatchObject({ state: 'resubmitted', resubmissions: 1, decision: null });
		expect((await tdb()('dwellings').where({ id: d.id }).first()).status).toBe('awaiting-review');
		await audits.decideItem(sup, item.id, { decision: 'accepted', comment: '' });
		const detail = await audits.getItem(p.org.id, item.id);
		const decisions = detail!.history
			.filter((h) => h.action === 'audit-decision')
			.map((h) => h.details.decision);
		expect(decisions).toEqual(['returned', 'accepted']);
		expect(
			detail!.history.some(
				(h) => h.action === 'audit-resubmit' && h.details.comment === 'Checked; re-issued.'
			)
		).toBe(true);
		// the database refuses changes to past rows (trigger refuse_change)
		const row = await tdb()('activity_log').where({ entity_id: item.id, action: 'audit-decision' }).first();
		await expect(tdb()('activity_log').where({ id: row.id }).update({ details: '{}' })).rejects.toThrow(
			/append-only|permission denied for table activity_log/
		);
		await expect(tdb()('activity_log').where({ id: row.id }).del()).rejects.toThrow(
			/append-only|permission denied for table activity_log/
		);
		// summary counts
		const s = await audits.batchSummary(p.org.id, b.id);
		expect(s.byState.accepted).toBe(1);
		expect(s.resubmissions).toBe(1);
		expect(s.uByKind[0].kind).toBe('external-wall');
	});
});
