// A dwelling report issued with junctions, through the service and the database: the snapshot freezes
// them, the PDF has a page for the calculated one and lists the entered ψ with its source, a stored
// snapshot renders again to the same bytes, and an element report carries no junctions. Text by
// poppler's pdftotext (Debian poppler-utils). Build-ups generic, climate invented (factories).
import { describe, it, expect, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { hasDatabase, makeTeam } from '../../factories';
import { asMember, ref, WALL, makeClimate } from '../../factories-dwellings';

const work = mkdtempSync(path.join(tmpdir(), 'envelo-reports-junctions-'));

function pdfText(pdf: Buffer): string {
	const file = path.join(work, 'r.pdf');
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

describe.skipIf(!hasDatabase)('dwelling reports with junctions', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const junctions = await import('../../../src/lib/server/junctions');
	const reports = await import('../../../src/lib/server/reports');

	afterAll(async () => {
		rmSync(work, { recursive: true, force: true });
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('issues the junction pages and the heat-loss totals; the stored snapshot renders to the same bytes', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const climateId = await makeClimate(t.org.id);
		const d = await dwellings.createDwelling(m, { reference: ref('JR'), address: '2 Corner Row', climateId });
		const wall = await elements.createElement(m, d.id, WALL);
		const corner = await junctions.createJunction(m, d.id, {
			name: 'Front corners',
			type: 'external-corner',
			lengthM: 10.4,
			source: 'calculated',
			dimensionSystem: 'external',
			details: { mode: 'builder', elements: { a: wall.id } }
		});
		await junctions.createJunction(m, d.id, {
			name: 'Lintels',
			type: 'window-head',
			lengthM: 6,
			source: 'entered',
			dimensionSystem: 'external',
			psiEntered: 0.3,
			psiSource: 'Default table value, assumed (test)'
		});
		const caller = { userId: t.assessor.id, organisationId: t.org.id };
		const issued = await reports.issueReport(caller, { dwellingId: d.id }, 'http://127.0.0.1');
		const { pdf } = (await reports.getReportPdf(t.org.id, issued.id))!;
		const text = pdfText(pdf);
		expect(text).toContain('Junctions and transmission heat loss');
		expect(text).toMatch(
			/Lintels Window head 6\.00 0\.300 1\.80 entered, not calculated here source: Default table value, assumed \(test\)/
		);
		expect(text).toContain('Junctions: method and cautions');
		expect(text).toContain('JUNCTION 1 OF 1 · EXTERNAL CORNER (WALLS) Front corners');
		expect(text).toContain(`(used)`);
		expect(text).toContain('Cross-section and temperatures');
		const psi = corner.lastResult!.psi!;
		expect(text).toContain(`${psi < 0 ? '−' : ''}${Math.abs(psi).toFixed(3)}`);
		expect((await reports.rerenderReport(t.org.id, issued.id))!.equals(pdf)).toBe(true);

		const single = await reports.issueReport(
			caller,
			{ dwellingId: d.id, elementId: wall.id },
			'http://127.0.0.1'
		);
		const element = await reports.getReport(t.org.id, single.id);
		expect(element!.snapshot.junctions).toBeUndefined();
		expect(pdfText((await reports.getReportPdf(t.org.id, single.id))!.pdf)).not.toContain('Junction');
	});
});
