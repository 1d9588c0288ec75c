// The report's element pages for a floor over an unheated basement, a slab with edge insulation and a
// wall beside an unheated garage: the method section names ISO 13370's and ISO 6946's methods (with
// ISO 13789's air change) and states the intermediates, and the thermal table gives the right formula
// and Ru. Read back as poppler's pdftotext reads it. Figures are the hand calculations of
// tests/physics/element-basement.test.ts and element-unheated-space.test.ts (formulas from memory);
// the snapshot is built in memory (junction-snapshot.ts) and the elements are invented.
import { execFileSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyseElement, parseElementInput } from '../../../src/lib/physics';
import { toElementInput, type StoredBuildUp } from '../../../src/lib/dwellings/element-input';
import { renderPdf } from '../../../src/lib/server/pdf';
import { reportDocument } from '../../../src/lib/server/reports/document';
import type { SnapshotElement } from '../../../src/lib/server/reports/snapshot';
import { ELEMENTS, MONTHS, snapshotWith } from './junction-snapshot';

const work = mkdtempSync(path.join(tmpdir(), 'envelo-report-ground-types-'));

function element(
	id: string,
	name: string,
	kind: 'external-wall' | 'ground-floor',
	area: number,
	buildUp: StoredBuildUp
) {
	const heatFlow = kind === 'ground-floor' ? 'downward' : 'horizontal';
	const internal = { temperature: 20, humidityClass: 3 as const };
	const parsed = parseElementInput(toElementInput({ heatFlow, buildUp, internal }, MONTHS));
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
	const result = analyseElement(parsed.data);
	return {
		...ELEMENTS[0],
		id,
		name,
		kind,
		area,
		heatFlow,
		buildUp,
		internal,
		input: parsed.data,
		result,
		u: result.uValueRounded,
		limit: null,
		pass: null
	} as SnapshotElement;
}

const insulation = (r: number) => ({ name: 'Insulation board', thicknessMm: r * 40, lambda: 0.04, mu: 50 });

describe('the report of a basement, an edge-insulated slab and a wall beside an unheated space', () => {
	it('names each method and its intermediates', async () => {
		const s = snapshotWith(undefined);
		s.elements = [
			element('00000000-0000-4000-8000-00000000c001', 'Floor over the cellar', 'ground-floor', 100, {
				layers: [insulation(1.66)],
				ground: {
					perimeterM: 40,
					areaM2: 100,
					basement: {
						kind: 'unheated',
						depthM: 2.5,
						wallR: 0.2,
						floorR: 0,
						wallAboveGroundHeightM: 0.5,
						wallAboveGroundU: 1.5,
						airChangeRate: 0.3,
						volumeM3: 250
					}
				}
			}),
			element('00000000-0000-4000-8000-00000000c002', 'Kitchen slab', 'ground-floor', 100, {
				layers: [{ name: 'Concrete slab', thicknessMm: 100, lambda: 1, mu: 100 }],
				ground: {
					perimeterM: 40,
					areaM2: 100,
					edge: { orientation: 'horizontal', widthM: 1, insulationThicknessM: 0.05, insulationR: 2 }
				}
			}),
			element('00000000-0000-4000-8000-00000000c003', 'Wall to the garage', 'external-wall', 20, {
				layers: [{ name: 'Insulated wall', thicknessMm: 73.2, lambda: 0.04, mu: 10 }],
				unheatedSpace: {
					internalAreaM2: 20,
					externalElements: [
						{ name: 'garage walls', areaM2: 40, uValue: 1.5 },
						{ name: 'garage roof', areaM2: 20, uValue: 2 },
						{ name: 'garage door', areaM2: 6, uValue: 3 }
					],
					airtightness: 'some-open-joints',
					volumeM3: 60
				}
			})
		];
		const file = path.join(work, 'report.pdf');
		writeFileSync(file, await renderPdf(reportDocument(s)));
		if (process.env.KEEP_REPORT_PDF) copyFileSync(file, process.env.KEEP_REPORT_PDF);
		const t = execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
		// unheated basement, ISO 13370:2017, 8.4: Uf 0.5, Ubf 0.4965, Ubw 0.8361, U 0.3950
		expect(t).toContain('The unheated basement by ISO 13370:2017, 8.3 and 8.4');
		expect(t).toContain('Uf = 1/(Rsi + Rf + Rsi)');
		expect(t).toMatch(/Ubf = [^;]*= 0\.4965/);
		expect(t).toMatch(/Ubw = [^;]*= 0\.8361/);
		expect(t).toContain('unheated basement: 1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V)');
		// edge insulation: U0 0.6963, Δψ −0.3495, U 0.5565
		expect(t).toContain('R′ = Rn − dn/λg = 1.975');
		expect(t).toContain('Δψ = −(λg/π)');
		expect(t).toContain('\u22120.3495');
		// unheated space, ISO 6946:2017, 6.10.3: Ru = 20/177.40 = 0.1127
		expect(t).toContain('ISO 6946:2017, 6.10.3');
		expect(t).toContain('ISO 13789');
		expect(t).toContain('Ru = 20/177.40 = 0.1127');
		expect(t).toContain('Unheated space Ru 0.1127');
	});
});
