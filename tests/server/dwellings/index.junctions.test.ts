// Junctions in the dwelling's record: what differs between the issued record and the working copy
// (added, removed, and a changed length, ψ as printed to 3 decimals, or build, in the screen's words),
// counted on every write with who and when; a report that would print a ψ other than the one saved
// is refused until the junction is recalculated; a copied dwelling keeps its junctions, pointing at
// the copied elements. Envelo's own rules (common practice, no source); the physics of ψ is tested in
// tests/junctions and tests/physics.
import { describe, expect, it, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb } from '../../factories';
import { asMember, ref, WALL, makeClimate } from '../../factories-dwellings';
import {
	compareJunctions,
	compareRecords,
	type ComparedJunction,
	type ComparedRecord
} from '../../../src/lib/dwellings/changes';

const junction = (over: Partial<ComparedJunction> = {}): ComparedJunction => ({
	id: 'j1',
	name: 'Corners',
	type: 'external-corner',
	lengthM: 10.4,
	source: 'calculated',
	dimensionSystem: 'external',
	psiEntered: null,
	psiSource: null,
	details: { mode: 'builder', elements: { a: 'e1' } },
	model: null,
	psi: -0.1163,
	...over
});
const record = (junctions?: ComparedJunction[]): ComparedRecord => ({
	dwelling: { address: '1 Row' },
	limitTable: null,
	elements: [],
	...(junctions ? { junctions } : {})
});

describe('junction changes since issue', () => {
	it('names added and removed junctions', () => {
		const changes = compareRecords(
			record([junction()]),
			record([junction({ id: 'j2', name: 'Edge', type: 'ground-floor' })])
		);
		expect(changes).toEqual([
			{
				elementId: null,
				junctionId: 'j1',
				element: 'Corners (junction)',
				field: 'Junction',
				before: 'present',
				after: 'removed'
			},
			{
				elementId: null,
				junctionId: 'j2',
				element: 'Edge (junction)',
				field: 'Junction',
				before: 'absent',
				after: 'added (Wall – ground floor)'
			}
		]);
	});

	it('lists a changed length, ψ and build field by field; ψ only when it prints differently', () => {
		const names = new Map([
			['e1', 'Front wall'],
			['e2', 'Side wall']
		]);
		const after = junction({
			lengthM: 12,
			psi: -0.0981,
			details: { mode: 'builder', elements: { a: 'e1', b: 'e2' }, gap: { widthMm: 40, lambda: 0.5 } }
		});
		expect(compareJunctions(junction(), after, names).map((c) => [c.field, c.before, c.after])).toEqual([
			['Length (m)', '10.4', '12'],
			['ψ (W/(m·K))', '−0.116', '−0.098'],
			['Second element', '—', 'Side wall'],
			['Gap in the insulation', '—', 'width (mm) 40, λ (W/(m·K)) 0.5']
		]);
		expect(compareJunctions(junction(), junction({ psi: -0.11631 }))).toEqual([]);
	});

	it('an entered ψ: its value and its source; a free-form model as changed', () => {
		const entered = junction({
			source: 'entered',
			details: null,
			psiEntered: 0.3,
			psi: 0.3,
			psiSource: 'Table A'
		});
		expect(
			compareJunctions(entered, { ...entered, psiEntered: 0.25, psi: 0.25, psiSource: 'Table B' }).map(
				(c) => c.field
			)
		).toEqual(['ψ (W/(m·K))', 'Source of the entered ψ']);
		const free = junction({
			type: 'other',
			details: { mode: 'free-form', elements: {} },
			model: { regions: [1] }
		});
		expect(compareJunctions(free, { ...free, model: { regions: [2] } })).toMatchObject([
			{ field: 'Free-form model', before: 'changed', after: 'changed' }
		]);
	});

	it('a record frozen before junctions were reported counts today’s junctions as added, and none as none', () => {
		expect(compareRecords(record(), record([junction()])).map((c) => c.after)).toEqual([
			'added (External corner (walls))'
		]);
		expect(compareRecords(record(), record([]))).toEqual([]);
	});
});

describe.skipIf(!hasDatabase)('junctions in the dwelling’s record', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const junctions = await import('../../../src/lib/server/junctions');
	const reports = await import('../../../src/lib/server/reports');
	const { changesSinceIssue } = await import('../../../src/lib/server/reports/changes');
	const { ValidationError } = await import('../../../src/lib/server/errors');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const corner = (wallId: string, over: Record<string, unknown> = {}) => ({
		name: 'Front corners',
		type: 'external-corner',
		lengthM: 10.4,
		source: 'calculated',
		dimensionSystem: 'external',
		details: { mode: 'builder', elements: { a: wallId } },
		...over
	});
	const lintels = {
		name: 'Lintels',
		type: 'window-head',
		lengthM: 6,
		source: 'entered',
		dimensionSystem: 'external',
		psiEntered: 0.3,
		psiSource: 'Default table value, assumed (test)'
	};

	async function arrange() {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const climateId = await makeClimate(t.org.id);
		const d = await dwellings.createDwelling(m, { reference: ref('JC'), address: '1 Corner Row', climateId });
		const wall = await elements.createElement(m, d.id, WALL);
		const a = await junctions.createJunction(m, d.id, corner(wall.id));
		const b = await junctions.createJunction(m, d.id, lintels);
		const caller = { userId: t.assessor.id, organisationId: t.org.id };
		return { t, m, d, wall, a, b, caller };
	}
	const issue = (caller: { userId: string; organisationId: string }, dwellingId: string) =>
		reports.issueReport(caller, { dwellingId }, 'http://127.0.0.1');
	const count = async (id: string) =>
		(await tdb()('dwellings').where({ id }).first('issue_changes')).issue_changes;
	const thinner = async (orgId: string, id: string, mm: number) => {
		const el = (await elements.getElement(orgId, id))!;
		return {
			name: el.name,
			kind: el.kind,
			area: el.area,
			heatFlow: el.heatFlow,
			buildUp: {
				...el.buildUp,
				layers: el.buildUp!.layers.map((l, i) => (i === 1 ? { ...l, thicknessMm: mm } : l))
			},
			internal: el.internal,
			version: el.version
		};
	};

	it('the issued report freezes the junctions; a junction added, removed or changed counts, with who and when', async () => {
		const x = await arrange();
		const report = await issue(x.caller, x.d.id);
		const full = await reports.getReport(x.t.org.id, report.id);
		expect(full!.snapshot.junctions!.map((j) => [j.name, j.source])).toEqual([
			['Front corners', 'calculated'],
			['Lintels', 'entered']
		]);
		expect(full!.snapshot.junctions![0].psi).toBeCloseTo(x.a.lastResult!.psi!, 10);
		expect(full!.snapshot.junctions![0].field!.values.length).toBeGreaterThan(100);
		expect(await count(x.d.id)).toBe(0);

		await junctions.updateJunction(x.m, x.a.id, { ...junctions.fieldsOf(x.a), lengthM: 12, version: 1 });
		expect(await count(x.d.id)).toBe(1);
		const length = (await changesSinceIssue(x.t.org.id, x.d.id)).changes[0];
		expect(length).toMatchObject({
			elementId: null,
			junctionId: x.a.id,
			element: 'Front corners (junction)',
			field: 'Length (m)',
			before: '10.4',
			after: '12'
		});
		expect(length.by).toBeTruthy();
		expect(length.at).toBeTruthy();

		await junctions.deleteJunction(x.m, x.b.id, 1);
		await junctions.createJunction(x.m, x.d.id, { ...lintels, name: 'Heads', psiEntered: 0.25 });
		const gap = { mode: 'builder', elements: { a: x.wall.id }, gap: { widthMm: 40, lambda: 0.5 } };
		await junctions.updateJunction(x.m, x.a.id, {
			...corner(x.wall.id, { lengthM: 12, details: gap }),
			version: 2
		});
		const { changes } = await changesSinceIssue(x.t.org.id, x.d.id);
		expect(changes.map((c) => [c.element, c.field, c.after])).toEqual([
			['Front corners (junction)', 'Length (m)', '12'],
			['Front corners (junction)', 'ψ (W/(m·K))', expect.stringMatching(/^−?\d\.\d{3}$/)],
			// the gap's values in the order jsonb keeps its keys
			['Front corners (junction)', 'Gap in the insulation', 'λ (W/(m·K)) 0.5, width (mm) 40'],
			['Lintels (junction)', 'Junction', 'removed'],
			['Heads (junction)', 'Junction', 'added (Window head)']
		]);
		expect(await count(x.d.id)).toBe(5);
	});

	it('refuses to issue a ψ other than the one saved until the junction is recalculated', async () => {
		const x = await arrange();
		await elements.updateElement(x.m, x.wall.id, await thinner(x.t.org.id, x.wall.id, 40));
		const refused = await issue(x.caller, x.d.id).catch((e) => e);
		expect(refused).toBeInstanceOf(ValidationError);
		expect(refused.issues.map((i: { message: string }) => i.message)).toEqual([
			expect.stringMatching(
				/^Junction "Front corners": the dwelling’s elements now give ψ −?\d\.\d{3} W\/\(m·K\) and fRsi 0\.\d{3}, not the ψ −?\d\.\d{3} and fRsi 0\.\d{3} saved with it: recalculate the junction on its page before issuing\.$/
			)
		]);
		expect(await tdb()('reports').where({ dwelling_id: x.d.id })).toHaveLength(0);
		// a draft still previews, with the figures computed now
		const draft = await reports.previewReport(x.caller, { dwellingId: x.d.id });
		expect(draft.problems).toHaveLength(1);
		// the reports page's cheaper check finds the same (it solves only junctions whose elements changed)
		const check = () =>
			reports.buildSnapshot(
				x.t.org.id,
				x.d.id,
				null,
				{
					scope: 'dwelling',
					draft: true,
					number: 'DRAFT',
					revision: 0,
					verificationCode: null,
					verifyUrl: null,
					supersedes: null,
					issuedBy: { id: x.t.assessor.id, name: '' }
				},
				new Date().toISOString(),
				undefined,
				{ junctions: 'check' }
			);
		expect((await check()).problems).toEqual(refused.issues.map((i: { message: string }) => i.message));
		await junctions.recalculateJunction(x.m, x.a.id, 1);
		const after = await check();
		expect(after.problems).toEqual([]);
		expect(after.snapshot.junctions![0].field).toBeNull();
		const issued = await issue(x.caller, x.d.id);
		expect(issued.revision).toBe(1);
	});

	it('a copy keeps the junctions in their order, built from the copied elements', async () => {
		const x = await arrange();
		const copy = await dwellings.copyDwelling(x.m, x.d.id, { reference: ref('JC-COPY') });
		const [wall] = await elements.listElementSummaries(x.t.org.id, copy.id);
		const list = await junctions.listJunctions(x.t.org.id, copy.id);
		expect(list.map((j) => [j.name, j.source, j.psi])).toEqual([
			['Front corners', 'calculated', x.a.lastResult!.psi],
			['Lintels', 'entered', 0.3]
		]);
		const copied = (await junctions.getJunction(x.t.org.id, list[0].id))!;
		expect(copied.details!.elements).toEqual({ a: wall.id });
		expect(copied.lastResult!.elements).toEqual([{ id: wall.id, name: WALL.name, version: 1 }]);
		expect(copied.model).toEqual(x.a.model);
		// the original is untouched, and the copy computes to the same ψ from its own elements
		expect((await junctions.getJunction(x.t.org.id, x.a.id))!.details!.elements).toEqual({ a: x.wall.id });
		const again = await junctions.recalculateJunction(x.m, copied.id, 1);
		expect(again.lastResult!.psi).toBeCloseTo(x.a.lastResult!.psi!, 12);
		const log = await tdb()('activity_log')
			.where({ entity: 'dwelling', entity_id: copy.id, action: 'copy' })
			.first();
		expect(log.details).toMatchObject({ elements: 1, junctions: 2 });
	});
});
