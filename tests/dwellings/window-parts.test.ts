// A window's parts kept with the element (src/lib/dwellings/window-parts.ts) and the audit's check of
// them. The expected U is the area-weighted formula of ISO 10077-1 (recalled from memory), worked by
// hand beside each check: Uw = (Ag·Ug + Af·Uf + lg·ψg)/(Ag + Af). Product values are invented.
import { describe, expect, it } from 'vitest';
import { checkWindowParts, windowPartsSource } from '../../src/lib/dwellings/window-parts';
import { validateElement } from '../../src/lib/dwellings/schema';
import { windowPartsDisagree } from '../../src/lib/audit/checks/results';
import { contextOf, glazed } from '../audit/bundles';

// Ag 1.2 m², Ug 1.1; Af 0.4 m², Uf 1.4; lg 4.4 m, ψg 0.06:
// Uw = (1.32 + 0.56 + 0.264)/1.6 = 2.144/1.6 = 1.34 W/(m²·K)
const PARTS = {
	frameMaterial: 'pvc-three-chambers',
	glazings: [
		{ areaM2: 1.2, uValue: 1.1, perimeterM: 4.4, psi: 0.06, spacer: 'improved', glazingType: 'low-e' }
	],
	frames: [{ areaM2: 0.4, uValue: 1.4 }]
};

describe('checkWindowParts', () => {
	it('works out U from the parts and names every part in the source', () => {
		const c = checkWindowParts(PARTS, 'window', null);
		expect(c.ok).toBe(true);
		if (!c.ok) return;
		expect(c.result.uValue).toBeCloseTo(1.34, 12);
		expect(c.u).toBe(1.34);
		expect(c.source).toBe(windowPartsSource(c.parts, c.result));
		expect(c.source).toContain('ISO 10077-1 from its parts: Uw = 1.340 W/(m²·K)');
		expect(c.source).toContain('Ug 1.1 over Ag 1.2 m²');
		expect(c.source).toContain('Uf 1.4 (given) over Af 0.4 m²');
	});

	it('refuses a given U the parts do not give, on givenU', () => {
		const c = checkWindowParts(PARTS, 'window', 1.5);
		expect(c.ok).toBe(false);
		if (c.ok) return;
		expect(c.issues).toEqual([
			{
				path: 'givenU',
				message:
					'is 1.5 W/(m²·K), but the parts kept with it give 1.34: use the parts’ figure, or remove the parts to give a declared value'
			}
		]);
		expect(checkWindowParts(PARTS, 'window', 1.34).ok).toBe(true);
	});

	it('names a bad part under windowParts', () => {
		const c = checkWindowParts({ ...PARTS, frames: [{ areaM2: -1, uValue: 1.4 }] }, 'window', null);
		expect(c.ok ? [] : c.issues.map((i) => i.path)).toEqual(['windowParts.frames.0.areaM2']);
	});
});

describe('an element with its parts', () => {
	const window = { name: 'Kitchen window', kind: 'window', area: 1.6, windowParts: PARTS };

	it('takes its U and source from the parts when none is given', () => {
		const v = validateElement(window, null);
		expect(v.ok).toBe(true);
		if (!v.ok) return;
		expect(v.data.givenU).toBe(1.34);
		expect(v.data.givenUSource).toContain('ISO 10077-1 from its parts');
		expect(v.data.windowParts).toMatchObject({ kind: 'window', frameMaterial: 'pvc-three-chambers' });
	});

	it('keeps a source the assessor wrote', () => {
		const v = validateElement({ ...window, givenUSource: 'Survey sheet 4, parts measured on site' }, null);
		expect(v.ok && v.data.givenUSource).toBe('Survey sheet 4, parts measured on site');
	});

	it('refuses parts on a wall', () => {
		const v = validateElement({ name: 'Wall', kind: 'external-wall', area: 10, windowParts: PARTS }, null);
		expect(v.ok ? [] : v.issues).toEqual([
			{ path: 'windowParts', message: 'are kept for a window or door only' }
		]);
	});
});

describe('the audit of a window kept with its parts', () => {
	it('raises nothing when the given U follows from the parts', () => {
		expect(windowPartsDisagree(contextOf(glazed('w1', 1.34, { windowParts: PARTS })))).toEqual([]);
	});
	it('flags a given U that the parts no longer give', () => {
		const flags = windowPartsDisagree(contextOf(glazed('w1', 1.2, { windowParts: PARTS })));
		expect(flags).toHaveLength(1);
		expect(flags[0]).toMatchObject({ code: 'not-reproducing', severity: 'high', elementId: 'w1' });
		expect(flags[0].reason).toContain('the parts kept with it give 1.34');
	});
	it('raises nothing for a declared U without parts', () => {
		expect(windowPartsDisagree(contextOf(glazed('w1', 1.2)))).toEqual([]);
	});
});
