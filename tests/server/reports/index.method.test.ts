// The report says the method it used, every "not assessed" names its true reason, the heat flux is one
// figure with its definition, and the mass-balance caution shows when the result carries it.
// Sources of the expected numbers (hand calculations beside each):
//   - ISO 6946:2017 (from memory): Rsi 0.10 / 0.13 / 0.17 and Rse 0.04 m²·K/W (Table 7); R = d/λ and
//     RT = Rsi + ΣR + Rse (6.7.1); combined method R′T, R″T (6.7.2); roof-space resistance Ru 0.2 m²·K/W
//     for tiles with felt or boards under them (the roof-space table, cited as the engine's note cites it);
//   - ISO 13370:2017, 8.1, slab on ground (from memory): B′ = A/(0.5·P), dt = w + λg·(Rsi + Rf + Rse),
//     w 0.3 m and λg 2.0 W/(m·K) by default, dt < B′: U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1);
//   - ISO 13788:2012 clause 6 (from memory): the Glaser method needs the external air on the outer face,
//     so a floor on the ground is not assessed for interstitial condensation;
//   - U = q/(θi − θe) (ISO 6946:2017 clause 3, from memory), so the mean heat flux is q = U·(θi − θe);
//   - the 1 % threshold of the mass-balance caution is this product's (common practice, no source).
import { describe, it, expect, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { hasDatabase, makeTeam, tdb } from '../../factories';
import {
	makeClimate,
	makeDwelling,
	makeElement,
	makeLimitTable,
	leakyTimberWall,
	COLD_CLIMATE
} from '../../factories-reports';

const ORIGIN = 'http://127.0.0.1:3999';
const work = mkdtempSync(path.join(tmpdir(), 'envelo-reports-method-'));

/** Text of a PDF by poppler's pdftotext (Debian poppler-utils), page headers and footers left out. */
function pdfText(pdf: Buffer): string {
	const file = path.join(work, 'r.pdf');
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
		.split(/\n|\f/)
		.filter((l) => !/Verify this report|^\s*Envelo\s/.test(l))
		.join('\n');
}
const flat = (s: string) => s.replace(/\s+/g, ' ');
/**
 * Whether `text` holds `part`, whitespace aside: pdftotext breaks lines anywhere a line may break
 * (also after "/"), so a phrase is compared without its spaces.
 */
const holds = (text: string, part: string) => text.replace(/\s+/g, '').includes(part.replace(/\s+/g, ''));

/** The flattened text of each element's pages, by the kicker "ELEMENT i OF n". */
function elementSections(text: string, n: number): string[] {
	const t = flat(text);
	return Array.from({ length: n }, (_, i) => {
		const start = t.indexOf(`ELEMENT ${i + 1} OF ${n}`);
		const end = i + 1 < n ? t.indexOf(`ELEMENT ${i + 2} OF ${n}`) : t.length;
		expect(start).toBeGreaterThanOrEqual(0);
		return t.slice(start, end);
	});
}
const between = (s: string, from: string, to: string) =>
	s.slice(s.indexOf(from), s.indexOf(to, s.indexOf(from)));

/** A 150 mm slab, λ 1.5, A 100 m², exposed perimeter 40 m. */
const slab = {
	layers: [{ name: 'Concrete slab', thicknessMm: 150, lambda: 1.5, mu: 100 }],
	ground: { perimeterM: 40, areaM2: 100 }
};
/** 12.5 mm plasterboard λ 0.25 and 200 mm mineral wool λ 0.04 under a tiled roof with felt. */
const loft = {
	layers: [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 8 },
		{ name: 'Mineral wool', thicknessMm: 200, lambda: 0.04, mu: 1 }
	],
	roofSpace: 'tiles-with-felt-or-boards'
};

describe.skipIf(!hasDatabase)('reports: method, reasons and the heat flux', async () => {
	const reports = await import('../../../src/lib/server/reports');
	const { moistureWord } = await import('../../../src/lib/server/reports/document');

	afterAll(async () => {
		rmSync(work, { recursive: true, force: true });
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	async function dwellingWith(elements: NonNullable<Parameters<typeof makeElement>[2]>[]) {
		const team = await makeTeam();
		await makeLimitTable(team.org.id);
		const climateId = await makeClimate(team.org.id, COLD_CLIMATE, `Cold test climate ${Date.now()}`);
		const climate = await tdb()('climates').where({ id: climateId }).first('name');
		const dwelling = await makeDwelling(team.org.id, { assessorId: team.assessor.id, climateId });
		for (const [i, e] of elements.entries())
			await makeElement(team.org.id, dwelling.id, { ...e, position: i });
		const caller = { userId: team.assessor.id, organisationId: team.org.id };
		const issued = await reports.issueReport(caller, { dwellingId: dwelling.id }, ORIGIN);
		const full = (await reports.getReport(team.org.id, issued.id))!;
		const pdf = (await reports.getReportPdf(team.org.id, issued.id))!.pdf;
		return { team, climateName: climate.name as string, full, text: pdfText(pdf) };
	}

	const GROUND = {
		name: 'Ground floor',
		kind: 'ground-floor',
		heatFlow: 'downward',
		area: 100,
		buildUp: slab
	};
	const LOFT = { name: 'Loft ceiling', kind: 'pitched-roof-ceiling', heatFlow: 'upward', buildUp: loft };
	const TIMBER = {
		name: 'Timber wall',
		buildUp: leakyTimberWall(),
		internal: { temperature: 20, relativeHumidity: 60 }
	};
	/** One dwelling report of a ground floor, a loft ceiling and a bridged timber wall, issued once. */
	let issuedOnce: ReturnType<typeof dwellingWith> | undefined;
	const threeElements = () => (issuedOnce ??= dwellingWith([GROUND, LOFT, TIMBER]));

	it('a ground floor is "not assessed" because it is on the ground, and its method is ISO 13370 with the build-up’s RT beside U', async () => {
		const { full, text, climateName } = await threeElements();
		const [ground] = elementSections(text, 3);
		const r = full.snapshot.elements[0].result!;
		expect(r.condensation).toBeUndefined();
		expect(r.surface).toBeDefined();
		// The page prints the element's climate, and does not claim that there is none.
		expect(holds(ground, climateName)).toBe(true);
		expect(holds(ground, 'not assessed: no climate')).toBe(false);
		expect(holds(ground, 'No climate is attached')).toBe(false);
		expect(holds(ground, 'not assessed: floor on the ground')).toBe(true);
		expect(
			holds(
				ground,
				'Interstitial condensation is not assessed for a floor in contact with the ground: the Glaser method with the external climate does not describe the ground under the slab.'
			)
		).toBe(true);
		// The summary's table says the same, never "no climate".
		expect(moistureWord(full.snapshot.elements[0])).toBe(
			'not assessed: floor on the ground; surface: no mould risk (fRsi passes)'
		);

		// Method: build-up RT = 0.17 + 0.150/1.5 + 0.04 = 0.310 m²·K/W (Rf = 0.100); B′ = 100/(0.5·40) =
		// 5.00 m; dt = 0.3 + 2.0·(0.17 + 0.100 + 0.04) = 0.920 m < B′;
		// U = 4/(π·5 + 0.92)·ln(π·5/0.92 + 1) = 0.6963 W/(m²·K); 1/U = 1.436 m²·K/W.
		const u = (4 / (Math.PI * 5 + 0.92)) * Math.log((Math.PI * 5) / 0.92 + 1);
		const method = between(ground, '2 Method', '3 Thermal resistance');
		expect(holds(method, 'ISO 13370:2017, 8.1')).toBe(true);
		expect(holds(method, 'B′ = A/(0.5·P) = 100/(0.5·40) = 5.00 m')).toBe(true);
		expect(holds(method, 'dt = w + λg·(Rsi + Rf + Rse) = 0.30 + 2.00·(0.17 + 0.100 + 0.04) = 0.920 m')).toBe(
			true
		);
		expect(holds(method, 'As dt < B′')).toBe(true);
		expect(holds(method, `U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1) = ${u.toFixed(4)} W/(m²·K)`)).toBe(true);
		expect(holds(method, 'RT = Rsi + ΣR + Rse = 0.310 m²·K/W')).toBe(true);
		expect(holds(method, 'for homogeneous layers in series: RT = Rsi + ΣR + Rse and U = 1/RT')).toBe(false);
		const table = between(ground, '3 Thermal resistance', '4 Temperature');
		expect(holds(table, 'Build-up RT = Rsi + ΣR + Rse 0.310 m²·K/W')).toBe(true);
		expect(holds(table, `Equivalent resistance 1/U ${(1 / u).toFixed(3)} m²·K/W`)).toBe(true);
		expect(holds(table, 'dt < B′: U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1)')).toBe(true);
		expect(holds(table, 'Total resistance RT')).toBe(false);
	});

	it('a dwelling whose only calculated element is a ground floor does not say that no climate is attached', async () => {
		const { text } = await dwellingWith([
			GROUND,
			{ name: 'Windows', kind: 'window', givenU: 1.4, givenUSource: 'declared' }
		]);
		const summary = flat(text.slice(0, text.indexOf('ELEMENT 1 OF 2')));
		expect(holds(summary, 'no climate attached')).toBe(false);
		expect(
			holds(
				summary,
				'no interstitial condensation check was run (not assessed for a floor in contact with the ground: Ground floor).'
			)
		).toBe(true);
	});

	it('a ceiling under a roof space names Ru and its table; a bridged wall its upper and lower limits', async () => {
		const { full, text } = await threeElements();
		const [, ceiling, wall] = elementSections(text, 3);
		const rLoft = full.snapshot.elements[1].result!;
		// The table as the engine's note cites it.
		const note = rLoft.notes.find((n) => n.startsWith('Roof space above the ceiling'))!;
		const cited = /Ru = [^(]*\(([^)]*)\)/.exec(note)![1];
		expect(cited).toMatch(/^ISO 6946:2017/);
		// RT = 0.10 + 0.0125/0.25 + 0.200/0.04 + 0.2 + 0.04 = 5.390 m²·K/W.
		const method = between(ceiling, '2 Method', '3 Thermal resistance');
		expect(holds(method, 'RT = Rsi + ΣR + Ru + Rse and U = 1/RT')).toBe(true);
		expect(holds(method, 'Ru = 0.20 m²·K/W')).toBe(true);
		expect(holds(method, `from ${cited}`)).toBe(true);
		expect(holds(method, 'RT = 5.390 m²·K/W')).toBe(true);
		expect(
			holds(between(ceiling, '3 Thermal resistance', '4 Temperature'), `Roof space Ru 0.20 m²·K/W (${cited})`)
		).toBe(true);

		// Studs 38 mm at 600 mm: clear field 0.13 + 0.05 + 3.5 + 0.05 + 0.04 + 0.04 = 3.81, through the stud
		// 1.3869 m²·K/W; R′T = 1/(0.93667/3.81 + 0.06333/1.3869) = 3.430; λ″ = 0.04570 W/(m·K),
		// R″T = 0.31 + 0.14/0.04570 = 3.373; RT = 3.402; e = (3.430 − 3.373)/(2·3.402) = 0.8 %.
		const wallMethod = between(wall, '2 Method', '3 Thermal resistance');
		expect(holds(wallMethod, 'combined method (6.7.2)')).toBe(true);
		expect(holds(wallMethod, 'R′T = 3.430 m²·K/W and R″T = 3.373 m²·K/W, so RT = 3.402 m²·K/W')).toBe(true);
		expect(holds(wallMethod, 'e = 0.8 %')).toBe(true);
	});

	it('prints one heat flux, q = U·(θi − θe), with its definition; not the clear-field figure', async () => {
		const { full, text } = await threeElements();
		const sections = elementSections(text, 3);
		// Timber wall: U = 1/3.402 = 0.29395 W/(m²·K), θi 20 °C, θe −8 °C (the coldest month of the
		// climate): q = 0.29395 · 28 = 8.23 W/m². Its clear field, 28/3.81 = 7.35 W/m², is not printed.
		const wall = sections[2];
		expect(
			holds(
				wall,
				'Heat flux q = U·(θi − θe) = 8.23 W/m²: the mean heat flux through the element at the design temperatures θi 20.0 °C and θe −8.0 °C'
			)
		).toBe(true);
		expect(full.snapshot.elements[2].result!.heatFlux).toBeCloseTo(28 / 3.81, 2);
		expect(holds(wall, '7.35 W/m²')).toBe(false);
		// Ground floor: q = 0.6963 · 28 = 19.50 W/m².
		const u = (4 / (Math.PI * 5 + 0.92)) * Math.log((Math.PI * 5) / 0.92 + 1);
		expect(holds(sections[0], `Heat flux q = U·(θi − θe) = ${(u * 28).toFixed(2)} W/m²`)).toBe(true);
	});

	it('shows the mass-balance caution beside the standard’s figures when the result carries it, and renders without it', async () => {
		const { full } = await threeElements();
		const snapshot = structuredClone(full.snapshot);
		const c = snapshot.elements[2].result!.condensation! as unknown as {
			maxAccumulation: number;
			peakMonth: number | null;
			evaporatesFully: boolean;
			outcome: string;
			massBalance?: unknown;
		};
		expect(c.outcome).not.toBe('none');
		const moisture = (t: string) =>
			between(elementSections(t, 3)[2], '6 Interstitial condensation', '7 Surface humidity');

		// Without the field (a result of an engine before it): no caution, and the section still renders.
		delete c.massBalance;
		const without = moisture(pdfText(await reports.renderSnapshot(snapshot)));
		expect(holds(without, 'Peak amount')).toBe(true);
		expect(holds(without, 'Caution: the monthly method created moisture')).toBe(false);

		// With 5 % of the peak created: the caution, in the moisture section, with both columns.
		const created = 0.05 * c.maxAccumulation;
		c.massBalance = {
			created,
			conserving: {
				months: [],
				maxAccumulation: c.maxAccumulation - created,
				peakMonth: c.peakMonth,
				evaporatesFully: c.evaporatesFully,
				outcome: c.outcome,
				created: 0
			}
		};
		const withIt = moisture(pdfText(await reports.renderSnapshot(snapshot)));
		expect(holds(withIt, 'Caution: the monthly method created moisture')).toBe(true);
		expect(holds(withIt, `created ${created.toFixed(1)} g/m² of moisture over the year`)).toBe(true);
		expect(holds(withIt, 'Kept in mass balance')).toBe(true);
		expect(
			holds(
				withIt,
				`Peak amount ${c.maxAccumulation.toFixed(1)} g/m² ${(c.maxAccumulation - created).toFixed(1)} g/m²`
			)
		).toBe(true);

		// At 1 % or less: nothing.
		(c.massBalance as { created: number }).created = 0.01 * c.maxAccumulation;
		const small = moisture(pdfText(await reports.renderSnapshot(snapshot)));
		expect(holds(small, 'Caution: the monthly method created moisture')).toBe(false);
	});
});
