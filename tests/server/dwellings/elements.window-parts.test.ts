// A window's ISO 10077-1 parts kept with the element: stored, duplicated and copied with it, refused
// when they do not give the stored U, frozen into the issued report with their calculation, and printed
// in the element's report. Uw = (Ag·Ug + Af·Uf + lg·ψg)/(Ag + Af) (ISO 10077-1, recalled from memory),
// worked by hand: (1.2·1.1 + 0.4·1.4 + 4.4·0.06)/1.6 = 1.34 W/(m²·K). Product values are invented.
import { describe, it, expect, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { hasDatabase, makeTeam, tdb } from '../../factories';

const PARTS = {
	frameMaterial: 'pvc-three-chambers',
	glazings: [
		{ areaM2: 1.2, uValue: 1.1, perimeterM: 4.4, psi: 0.06, spacer: 'improved', glazingType: 'low-e' }
	],
	frames: [{ areaM2: 0.4, uValue: 1.4 }]
};
const work = mkdtempSync(path.join(tmpdir(), 'envelo-window-parts-'));

describe.skipIf(!hasDatabase)('window parts on the server', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const reports = await import('../../../src/lib/server/reports');
	const { ValidationError } = await import('../../../src/lib/server/errors');
	const { asMember, ref } = await import('../../factories-dwellings');

	afterAll(async () => {
		rmSync(work, { recursive: true, force: true });
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('stores the parts with the U they give, keeps them on duplicate and copy, and refuses a U they do not give', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref() });
		const w = await elements.createElement(m, d.id, {
			name: 'Kitchen window',
			kind: 'window',
			area: 1.6,
			windowParts: PARTS
		});
		expect(w.givenU).toBe(1.34);
		expect(w.givenUSource).toContain('ISO 10077-1 from its parts: Uw = 1.340 W/(m²·K)');
		expect(w.windowParts).toMatchObject({ kind: 'window', frames: [{ areaM2: 0.4, uValue: 1.4 }] });
		const dup = await elements.duplicateElement(m, w.id);
		expect(dup.windowParts).toEqual(w.windowParts);
		const copy = await dwellings.copyDwelling(m, d.id, { reference: ref() });
		const copied = await tdb()('elements').where({ dwelling_id: copy.id, name: 'Kitchen window' }).first();
		expect(copied.window_parts).toEqual(w.windowParts);

		const err = await elements
			.createElement(m, d.id, {
				name: 'Bad',
				kind: 'window',
				area: 1.6,
				givenU: 1.6,
				givenUSource: 'x',
				windowParts: PARTS
			})
			.catch((x) => x);
		expect(err).toBeInstanceOf(ValidationError);
		expect(err.issues.map((i: { path: string }) => i.path)).toEqual(['givenU']);
		// a declared U without parts keeps working, and clears parts it replaces
		const declared = await elements.updateElement(m, w.id, {
			name: 'Kitchen window',
			kind: 'window',
			area: 1.6,
			givenU: 1.2,
			givenUSource: 'maker’s declaration (invented)',
			version: w.version
		});
		expect(declared.windowParts).toBeNull();
		expect(declared.givenU).toBe(1.2);
	});

	it('freezes the parts into the issued report and prints how the U was worked out', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref(), assessorId: t.assessor.id });
		const w = await elements.createElement(m, d.id, {
			name: 'Kitchen window',
			kind: 'window',
			area: 1.6,
			windowParts: PARTS
		});
		const issued = await reports.issueReport(
			{ userId: t.assessor.id, organisationId: t.org.id },
			{ dwellingId: d.id, elementId: w.id },
			'http://127.0.0.1:3999'
		);
		const row = await tdb()('reports').where({ id: issued.id }).first('snapshot');
		const el = row.snapshot.elements[0];
		expect(el.windowParts.input.frameMaterial).toBe('pvc-three-chambers');
		expect(el.windowParts.result.uValue).toBeCloseTo(1.34, 12);
		const stored = await reports.getReportPdf(t.org.id, issued.id);
		const file = path.join(work, 'w.pdf');
		writeFileSync(file, stored!.pdf);
		const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
		expect(text).toContain('Worked out from its parts (ISO 10077-1)');
		expect(text).toMatch(/Uw, whole window\s+1\.600\s+1\.340/);
	});
});
