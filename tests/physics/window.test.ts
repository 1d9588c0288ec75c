// Windows and doors by ISO 10077-1 (area-weighted method). The formula and the default table
// values (frames: ISO 10077-1:2006 Annex D; glazing edges: Tables E.1 and E.2) are quoted FROM
// MEMORY; every expected U is a hand calculation of that formula shown beside it. No worked example
// of the standard is reproduced. The window sizes are invented.
import { describe, expect, it } from 'vitest';
import {
	analyseWindow,
	FRAME_U_DEFAULT,
	parseWindowInput,
	PSI_DEFAULT,
	tabulatedPsi
} from '../../src/lib/physics/window';
import { CalculationInputError } from '../../src/lib/physics/calc-parse';

// A 1.23 m × 1.48 m window (1.8204 m²) with a 1.3 m² pane: frame 0.5204 m², visible perimeter 4.6 m
const pane = { name: 'double low-e', areaM2: 1.3, uValue: 1.1, perimeterM: 4.6 };
const frame = { name: 'outer frame', areaM2: 0.5204 };

describe('ISO 10077-1 area-weighted U of a window (formula from memory)', () => {
	it('Uw = (Ag·Ug + Af·Uf + lg·ψg)/(Ag + Af) with every value given', () => {
		// (1.3·1.1 + 0.5204·1.3 + 4.6·0.04)/(1.3 + 0.5204) = (1.43 + 0.67652 + 0.184)/1.8204 = 2.29052/1.8204 = 1.258251
		const r = analyseWindow({ glazings: [{ ...pane, psi: 0.04 }], frames: [{ ...frame, uValue: 1.3 }] });
		expect(r.symbol).toBe('Uw');
		expect(r.areaM2).toBeCloseTo(1.8204, 12);
		expect(r.terms).toEqual({
			glazing: expect.closeTo(1.43, 12),
			frames: expect.closeTo(0.67652, 12),
			panels: 0,
			glazingEdges: expect.closeTo(0.184, 12),
			panelEdges: 0
		});
		expect(r.uValue).toBeCloseTo(2.29052 / 1.8204, 12);
		expect(r.glazings[0].psiSource).toBe('given');
		expect(r.notes).toEqual([]);
	});

	it('several panes and frame parts are summed term by term', () => {
		// panes 0.6 m² (Ug 0.6, lg 3.2 m, ψ 0.035) and 0.4 m² (Ug 1.0, lg 2.6 m, ψ 0.05);
		// frames 0.3 m² (Uf 1.2) and 0.2 m² (Uf 1.6, a mullion)
		// Σ = 0.36 + 0.4 + 0.36 + 0.32 + 0.112 + 0.13 = 1.682; A = 1.5 m²; Uw = 1.121333
		const r = analyseWindow({
			glazings: [
				{ areaM2: 0.6, uValue: 0.6, perimeterM: 3.2, psi: 0.035 },
				{ areaM2: 0.4, uValue: 1.0, perimeterM: 2.6, psi: 0.05 }
			],
			frames: [
				{ areaM2: 0.3, uValue: 1.2 },
				{ areaM2: 0.2, uValue: 1.6 }
			]
		});
		expect(r.uValue).toBeCloseTo(1.682 / 1.5, 12);
		expect(r.glazingAreaM2).toBeCloseTo(1.0, 12);
		expect(r.frameAreaM2).toBeCloseTo(0.5, 12);
	});

	it('a door: UD with an opaque panel and its edge', () => {
		// glazing 0.3 m² (Ug 1.1, lg 2.2 m, ψg 0.06), panel 1.2 m² (Up 0.8, lp 4.4 m, ψp 0.03), frame 0.5 m² (Uf 1.5)
		// Σ = 0.33 + 0.96 + 0.75 + 0.132 + 0.132 = 2.304; A = 2.0 m²; UD = 1.152
		const r = analyseWindow({
			kind: 'door',
			glazings: [{ areaM2: 0.3, uValue: 1.1, perimeterM: 2.2, psi: 0.06 }],
			panels: [{ name: 'leaf panel', areaM2: 1.2, uValue: 0.8, perimeterM: 4.4, psi: 0.03 }],
			frames: [{ areaM2: 0.5, uValue: 1.5 }]
		});
		expect(r.symbol).toBe('UD');
		expect(r.uValue).toBeCloseTo(2.304 / 2.0, 12);
		expect(r.panelAreaM2).toBeCloseTo(1.2, 12);
		expect(r.method[0]).toMatch(/^ISO 10077-1 \(from memory\): UD = /);
	});

	it('a solid door without glazing: panel and frame only', () => {
		// (1.6·1.0 + 0.4·1.8 + 5.2·0)/(2.0) = (1.6 + 0.72)/2 = 1.16
		const r = analyseWindow({
			kind: 'door',
			glazings: [],
			panels: [{ areaM2: 1.6, uValue: 1.0, perimeterM: 5.2, psi: 0 }],
			frames: [{ areaM2: 0.4, uValue: 1.8 }]
		});
		expect(r.uValue).toBeCloseTo(1.16, 12);
	});
});

describe('ISO 10077-1 default values (tables from memory)', () => {
	it('frame Uf by material: PVC 2 chambers 2.2, 3 chambers 2.0, polyurethane with metal core 2.8, metal without break 5.9', () => {
		expect(FRAME_U_DEFAULT['pvc-two-chambers']).toBe(2.2);
		expect(FRAME_U_DEFAULT['pvc-three-chambers']).toBe(2.0);
		expect(FRAME_U_DEFAULT['polyurethane-metal-core']).toBe(2.8);
		expect(FRAME_U_DEFAULT['metal-no-thermal-break']).toBe(5.9);
		// read from curves in the standard, not recalled: no value
		expect(FRAME_U_DEFAULT.timber).toBeUndefined();
		expect(FRAME_U_DEFAULT['metal-thermal-break']).toBeUndefined();
	});

	it('ψg by spacer, frame and glazing (Tables E.1 and E.2)', () => {
		expect(PSI_DEFAULT.conventional['timber-or-pvc']).toEqual({ uncoated: 0.06, 'low-e': 0.08 });
		expect(PSI_DEFAULT.conventional['metal-thermal-break']).toEqual({ uncoated: 0.08, 'low-e': 0.11 });
		expect(PSI_DEFAULT.conventional['metal-no-thermal-break']).toEqual({ uncoated: 0.02, 'low-e': 0.05 });
		expect(PSI_DEFAULT.improved['timber-or-pvc']).toEqual({ uncoated: 0.05, 'low-e': 0.06 });
		expect(PSI_DEFAULT.improved['metal-thermal-break']).toEqual({ uncoated: 0.06, 'low-e': 0.08 });
		expect(PSI_DEFAULT.improved['metal-no-thermal-break']).toEqual({ uncoated: 0.01, 'low-e': 0.04 });
		expect(tabulatedPsi('timber', 'conventional', 'low-e')).toMatchObject({ psi: 0.08 });
		expect(tabulatedPsi('metal-no-thermal-break', 'improved', 'uncoated')).toMatchObject({ psi: 0.01 });
		expect(tabulatedPsi(undefined, undefined, 'single')).toMatchObject({ psi: 0 });
		expect(tabulatedPsi('polyurethane-metal-core', 'conventional', 'low-e')).toHaveProperty('reason');
	});

	it('a PVC window with only the frame material and spacer known', () => {
		// Uf 2.0 (3 chambers), ψg 0.06 (improved spacer, PVC, low-e):
		// (1.3·1.1 + 0.5204·2.0 + 4.6·0.06)/1.8204 = (1.43 + 1.0408 + 0.276)/1.8204 = 2.7468/1.8204 = 1.508899
		const r = analyseWindow({
			frameMaterial: 'pvc-three-chambers',
			glazings: [{ ...pane, spacer: 'improved', glazingType: 'low-e' }],
			frames: [frame]
		});
		expect(r.uValue).toBeCloseTo(2.7468 / 1.8204, 12);
		expect(r.frames[0].uValue).toBe(2.0);
		expect(r.frames[0].uSource).toMatch(/ISO 10077-1:2006, Annex D.*from memory/);
		expect(r.glazings[0].psi).toBe(0.06);
		expect(r.glazings[0].psiSource).toMatch(/Table E\.2.*from memory/);
		expect(r.notes).toHaveLength(2);
	});

	it('a given value wins over the table; metal without break notes the uncorrected Uf0', () => {
		const r = analyseWindow({
			frameMaterial: 'metal-no-thermal-break',
			glazings: [{ ...pane, uValue: 5.7, psi: 0, glazingType: 'single' }],
			frames: [{ areaM2: 0.3 }, { areaM2: 0.2, uValue: 7.0 }]
		});
		expect(r.frames.map((f) => f.uValue)).toEqual([5.9, 7.0]);
		expect(r.frames[1].uSource).toBe('given');
		expect(r.notes.join(' ')).toMatch(/developed frame areas/);
		// (1.3·5.7 + 0.3·5.9 + 0.2·7.0 + 0)/1.8 = (7.41 + 1.77 + 1.4)/1.8 = 5.877778
		expect(r.uValue).toBeCloseTo(10.58 / 1.8, 12);
	});

	it('carries the method and the cautions', () => {
		const r = analyseWindow({ glazings: [{ ...pane, psi: 0.04 }], frames: [{ ...frame, uValue: 1.3 }] });
		expect(r.method.join(' ')).toContain('Σlg·ψg');
		expect(r.cautions.some((c) => c.includes('installation ψ'))).toBe(true);
		expect(r.cautions.some((c) => c.includes('professional judgement'))).toBe(true);
	});
});

describe('ISO 10077-1 input validation', () => {
	const issues = (raw: unknown) => {
		const p = parseWindowInput(raw);
		return p.ok ? [] : p.issues;
	};

	it('names each bad field, counted from one', () => {
		const found = issues({
			kind: 'gate',
			frameMaterial: 'timber',
			glazings: [{ name: 'pane', areaM2: 0, uValue: 1.1, perimeterM: -4.6, glazingType: 'low-e' }, 3],
			frames: [{ areaM2: 0.52 }]
		});
		expect(Object.fromEntries(found.map((i) => [i.path, i.message]))).toEqual({
			kind: 'Kind must be one of "window", "door", got the text "gate"',
			'glazings.0.areaM2': 'Glazing 1 (“pane”): area must be greater than 0 m², got 0',
			'glazings.0.perimeterM': 'Glazing 1 (“pane”): visible perimeter must be 0 m or more, got -4.6',
			'glazings.0.psi':
				'Glazing 1 (“pane”): ψ is missing: give ψg, or the spacer (with frameMaterial) for the table value',
			'glazings.1': 'Glazing 2 must be an object with areaM2, uValue and perimeterM',
			'frames.0.uValue':
				'Frame 1: U-value must be given: the table has no single value for frames of timber (it depends on the profile)'
		});
	});

	it('needs a frame, a frame U or material, and finite numbers', () => {
		expect(issues({ glazings: [], frames: [] }).map((i) => i.path)).toEqual(['frames']);
		expect(issues({ glazings: [], frames: [{ areaM2: 1 }] }).map((i) => i.path)).toEqual(['frames.0.uValue']);
		expect(
			issues({ glazings: [{ ...pane, psi: Infinity }], frames: [{ areaM2: 1, uValue: 1 }] }).map(
				(i) => i.path
			)
		).toEqual(['glazings.0.psi']);
		expect(
			issues({ glazings: [{ ...pane, psi: 0.04 }], frames: [{ areaM2: 1, uValue: 60 }] })[0].message
		).toMatch(/at most 10 W\/\(m²·K\), got 60/);
		expect(() => analyseWindow({ frames: [] })).toThrow(CalculationInputError);
	});
});
