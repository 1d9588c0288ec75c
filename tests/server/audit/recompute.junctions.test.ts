// The audit recomputes a dwelling's junctions from the database as it does its elements: the issued
// figures cut out of the report's snapshot in SQL, the junctions computed again from their stored
// choices and the dwelling's elements as they are now. The audit's rules are common practice, no
// source; build-ups generic and the climate invented (factories).
import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam } from '../../factories';
import { asMember, ref, WALL, makeClimate } from '../../factories-dwellings';

describe.skipIf(!hasDatabase)('the audit of junctions', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const junctions = await import('../../../src/lib/server/junctions');
	const reports = await import('../../../src/lib/server/reports');
	const { auditDwellingsWith } = await import('../../../src/lib/server/audit/recompute');
	const { db } = await import('../../../src/lib/server/db');

	afterAll(async () => {
		const { authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('reproduces the issued ψ and fRsi, then flags what changed since, an entered ψ and a removed junction', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const climateId = await makeClimate(t.org.id);
		const d = await dwellings.createDwelling(m, { reference: ref('JA'), address: '3 Corner Row', climateId });
		const wall = await elements.createElement(m, d.id, WALL);
		const corner = await junctions.createJunction(m, d.id, {
			name: 'Front corners',
			type: 'external-corner',
			lengthM: 10.4,
			source: 'calculated',
			dimensionSystem: 'external',
			details: { mode: 'builder', elements: { a: wall.id } }
		});
		const entered = {
			name: 'Lintels',
			type: 'window-head',
			lengthM: 6,
			source: 'entered',
			dimensionSystem: 'external',
			psiEntered: 0.3,
			psiSource: 'Default table value, assumed (test)'
		};
		const lintels = await junctions.createJunction(m, d.id, entered);
		const sills = await junctions.createJunction(m, d.id, { ...entered, name: 'Sills', type: 'window-sill' });
		await reports.issueReport(
			{ userId: t.assessor.id, organisationId: t.org.id },
			{ dwellingId: d.id },
			'http://127.0.0.1'
		);

		const first = (await auditDwellingsWith(db, t.org.id, [d.id])).get(d.id)!;
		expect(first.junctions!.map((j) => [j.name, j.inSnapshot])).toEqual([
			['Front corners', true],
			['Lintels', true],
			['Sills', true]
		]);
		const c = first.junctions![0];
		expect(c.issued!.psi).toBeCloseTo(corner.lastResult!.psi!, 10);
		expect(c.issued!.fRsi).toBeCloseTo(corner.lastResult!.surface.fRsi, 10);
		expect(c.current!.psi).toBeCloseTo(c.issued!.psi!, 10);
		// the wall's own flags aside, only the entered ψ-values are flagged
		expect(first.flags.filter((f) => f.junctionId).map((f) => [f.code, f.junctionId])).toEqual([
			['psi-entered', lintels.id],
			['psi-entered', sills.id]
		]);

		// less insulation in the wall, the junction not recalculated; one junction removed
		const el = (await elements.getElement(t.org.id, wall.id))!;
		await elements.updateElement(m, wall.id, {
			name: el.name,
			kind: el.kind,
			area: el.area,
			heatFlow: el.heatFlow,
			buildUp: {
				...el.buildUp,
				layers: el.buildUp!.layers.map((l, i) => (i === 1 ? { ...l, thicknessMm: 40 } : l))
			},
			internal: el.internal,
			version: el.version
		});
		await junctions.deleteJunction(m, sills.id, 1);
		const second = (await auditDwellingsWith(db, t.org.id, [d.id])).get(d.id)!;
		const codes = second.flags.map((f) => `${f.code}:${f.junctionId ?? f.elementId ?? ''}`);
		expect(codes).toContain(`junction-changed:${corner.id}`);
		expect(codes).toContain(`stale-report:${sills.id}`);
		expect(codes).toContain(`stale-report:${wall.id}`);
		const changed = second.flags.find((f) => f.code === 'junction-changed')!;
		expect(changed.reason).toMatch(
			/^Junction "Front corners" \(External corner \(walls\)\), ψ on external dimensions: report .+ gives ψ = /
		);
		expect(second.removedJunctions).toEqual([
			{ id: sills.id, name: 'Sills', type: 'window-sill', issued: { psi: 0.3, fRsi: null } }
		]);
	});
});
