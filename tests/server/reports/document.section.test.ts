// The element pages of the report carry the section drawing of the build-up, its heat storage by
// ISO 13786 when the layers give density and specific heat (formulas from memory; the figures are
// checked against numpy in tests/dwellings/dynamic.test.ts), and assumptions that say when a layer is
// bridged. Read back as poppler's pdftotext (Debian poppler-utils) reads it. The snapshot is built in
// memory (junction-snapshot.ts; invented values, common practice, no source).
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { renderPdf } from '../../../src/lib/server/pdf';
import { reportDocument } from '../../../src/lib/server/reports/document';
import { elementDynamics } from '../../../src/lib/dwellings/dynamic';
import { snapshotWith } from './junction-snapshot';

const work = mkdtempSync(path.join(tmpdir(), 'envelo-report-section-'));
async function text(snapshot: ReturnType<typeof snapshotWith>): Promise<string> {
	const file = path.join(work, `r${Math.random().toString(36).slice(2)}.pdf`);
	writeFileSync(file, await renderPdf(reportDocument(snapshot)));
	return execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

describe('the section drawing and heat storage in the report', () => {
	it('draws each element to scale, with its caption and the layers named', async () => {
		const t = await text(snapshotWith(undefined));
		expect(t).toContain('Layers to scale, inside on the left.');
		expect(t).toContain('Temperature and dew point in');
		// the words of the table and the moisture column read as sentences
		expect(t).not.toMatch(/\bnone; fRsi passes\b/);
	});

	it('gives the heat storage when every layer has density and specific heat', async () => {
		// without the values on every layer, no heat storage is printed
		expect(await text(snapshotWith(undefined))).not.toContain('Heat storage (ISO 13786');
		const s = snapshotWith(undefined);
		s.elements = s.elements.map((e) => ({ ...e })); // the shared elements stay as they are
		const wall = s.elements[0];
		const rho: Record<string, [number, number]> = {
			Plaster: [1300, 1000],
			Block: [1400, 1000],
			'Mineral wool': [30, 1030],
			Brick: [1800, 840]
		};
		wall.buildUp = {
			...wall.buildUp!,
			layers: wall.buildUp!.layers.map((l) => ({
				...l,
				density: rho[l.name][0],
				specificHeat: rho[l.name][1]
			}))
		};
		const d = elementDynamics(wall.buildUp, wall.result!);
		if (!d.ok) throw new Error(d.reason);
		const t = await text(s);
		expect(t).toContain('Heat storage (ISO 13786:2017, 24-hour period)');
		expect(t).toContain(`Areal heat capacity κ1 (inside) ${d.value.kappa1.toFixed(1)} kJ/(m²·K)`);
		expect(t).toContain(`Decrement factor f ${d.value.decrementFactor.toFixed(3)}`);
	});

	it('says which layers are bridged instead of calling every layer continuous', async () => {
		const s = snapshotWith(undefined);
		s.elements = s.elements.map((e) => ({ ...e }));
		const wall = s.elements[0];
		wall.input = {
			...wall.input!,
			layers: wall.input!.layers.map((l, i) =>
				i === 2 ? { ...l, bridge: { lambda: 0.13, fraction: 0.1 } } : l
			)
		};
		const t = await text(s);
		expect(t).toContain('except the bridged layers');
	});
});
