// The summary for the client: plain words built from the same verdicts as the technical pages. The
// elements below are invented for the tests (common practice, no source); only the fields the summary
// reads are given. What "meets the limit" means is the limit rule's (U as reported ≤ limit, with room
// for binary floating point only: limit-tables/rules.ts, common practice, no source); a moisture risk is
// the fabric summary's (condensate that accumulates, or a failed fRsi check: dwellings/summary.ts).
import { describe, expect, it } from 'vitest';
import type { ElementResult } from '../../src/lib/physics';
import {
	CLIENT_CAUTIONS,
	clientSummary,
	type ClientSummaryElement,
	type ClientSummaryInput
} from '../../src/lib/reports/client-summary';
import { meetsLimit } from '../../src/lib/limit-tables/rules';

type Outcome = 'none' | 'dries' | 'accumulates';

/** The parts of a result the summary reads: U, the Glaser outcome, the fRsi verdict, a floor on the ground. */
function result(opts: {
	u: number;
	condensation?: Outcome | null;
	surface?: { pass: boolean; month?: number } | null;
	ground?: boolean;
	warnings?: string[];
}): ClientSummaryElement['result'] {
	const c = opts.condensation === undefined ? 'none' : opts.condensation;
	const sf = opts.surface === undefined ? { pass: true } : opts.surface;
	return {
		uValue: opts.u,
		condensation: c
			? ({
					outcome: c,
					maxAccumulation: c === 'none' ? 0 : 120,
					peakMonth: c === 'none' ? null : 2,
					evaporatesFully: c !== 'accumulates'
				} as unknown as ElementResult['condensation'])
			: undefined,
		surface: sf
			? ({
					pass: sf.pass,
					fRsi: sf.pass ? 0.9 : 0.6,
					fRsiMin: 0.75,
					criticalMonth: sf.month ?? 1
				} as unknown as ElementResult['surface'])
			: undefined,
		ground: opts.ground ? ({} as ElementResult['ground']) : undefined,
		warnings: opts.warnings ?? []
	};
}

function wall(name: string, u: number, limit: number | null, r: Partial<Parameters<typeof result>[0]> = {}) {
	return {
		name,
		kind: 'external-wall',
		area: 20,
		heatFlow: 'horizontal',
		givenU: null,
		u,
		limit,
		result: result({ u, ...r })
	} satisfies ClientSummaryElement;
}

function input(elements: ClientSummaryElement[], over: Partial<ClientSummaryInput['document']> = {}) {
	return {
		dwelling: { reference: 'CS-1', address: '4 Summary Row', clientName: 'Sam Client' },
		organisation: { name: 'Test Organisation' },
		limitTable: { name: 'Test limits', edition: '2026' },
		elements,
		issuedAt: '2026-03-01T10:00:00.000Z',
		document: {
			scope: 'dwelling' as const,
			draft: false,
			number: 'TO-2026-0001',
			revision: 1,
			verificationCode: 'ABCD2345EF',
			verifyUrl: 'http://127.0.0.1:3999/verify/ABCD2345EF',
			...over
		}
	} satisfies ClientSummaryInput;
}

/** Every sentence of a summary, to search it as a reader would. */
function all(c: ReturnType<typeof clientSummary>): string {
	return [
		c.headline.text,
		...c.intro,
		...c.assessed.paragraphs,
		...c.heatLoss.paragraphs.map((p) => `${p.label ?? ''} ${p.text}`),
		...c.moisture.paragraphs.map((p) => `${p.label ?? ''} ${p.text}`),
		...c.nextSteps.items.map((p) => p.text),
		...c.cautions.items
	].join('\n');
}

describe('the summary for the client', () => {
	it('says plainly that every element meets its limit and that no damp or mould risk was found', () => {
		const c = clientSummary(
			input([
				// 0.30 against 0.30 meets: the figure as reported is compared (limit-tables/rules.ts)
				wall('Front wall', 0.3, 0.3),
				{
					name: 'Loft',
					kind: 'pitched-roof-ceiling',
					area: 40,
					heatFlow: 'upward',
					u: 0.14,
					limit: 0.16,
					result: result({ u: 0.14 })
				}
			])
		);
		expect(meetsLimit(0.3, 0.3)).toBe(true);
		expect(c.headline).toEqual({
			text: 'Every element with a limit meets it, and no damp or mould risk was found.',
			tone: 'pass'
		});
		expect(c.table.rows.map((r) => [r.name, r.kind, r.u, r.limit, r.verdict.text, r.moisture.text])).toEqual([
			['Front wall', 'Outside wall', '0.30', '0.30', 'meets its limit', 'No risk found'],
			['Loft', 'Sloping roof insulated at the ceiling', '0.14', '0.16', 'meets its limit', 'No risk found']
		]);
		expect(c.assessed.paragraphs[0]).toBe(
			'This report looks at two parts of the home’s outer shell, each called an element: one outside wall and one sloping roof insulated at the ceiling.'
		);
		const text = all(c);
		expect(text).toContain('Every element with a limit meets it.');
		expect(text).toContain('Nothing in this assessment calls for a change to the elements assessed.');
		expect(c.nextSteps.items.every((i) => i.tone !== 'fail')).toBe(true);
		// the jargon is explained where it is first used, once
		expect(text.match(/heat loss figure \(U-value\)/g)).toHaveLength(1);
		expect(text).toContain('(the surface temperature factor, fRsi)');
		expect(text).toContain('(the Glaser method)');
		// the verification line for an issued report, in the grouped form the PDF prints
		expect(text).toContain('at http://127.0.0.1:3999/verify/ABCD2345EF with the code ABCD-2345-EF');
	});

	it('names the element that fails its limit, with its figure and the limit, and what to do', () => {
		// 0.31 against 0.30 exceeds it (limit-tables/rules.ts: U > limit + 1e-9)
		const c = clientSummary(input([wall('Front wall', 0.28, 0.3), wall('Back wall', 0.31, 0.3)]));
		expect(meetsLimit(0.31, 0.3)).toBe(false);
		expect(c.headline.tone).toBe('fail');
		expect(c.headline.text).toBe('One element does not meet its limit: see what to do next below.');
		expect(c.table.rows[1].verdict).toEqual({ text: 'does not meet its limit', tone: 'fail' });
		expect(c.table.rows[0].verdict).toEqual({ text: 'meets its limit', tone: 'pass' });
		const fail = c.heatLoss.paragraphs.find((p) => p.tone === 'fail')!;
		expect(fail.text).toBe(
			'One element does not meet its limit: “Back wall” has 0.31 against a limit of 0.30 W/(m²·K). It lets more heat out than the limit allows.'
		);
		expect(c.heatLoss.paragraphs.find((p) => p.tone === 'pass')!.text).toBe(
			'The other element with a limit meets it.'
		);
		expect(c.nextSteps.items[0]).toEqual({
			text: 'Ask your assessor or designer how “Back wall” could be brought within its limit, for example with more or better insulation, and have the changed design assessed again.',
			tone: 'fail'
		});
		expect(all(c)).not.toContain('Nothing in this assessment calls for a change');
	});

	it('warns of mould where the inside surface fails the fRsi check, with the month', () => {
		const c = clientSummary(
			input([
				wall('Solid wall', 0.28, 0.3, { surface: { pass: false, month: 12 } }),
				wall('Front wall', 0.28, 0.3)
			])
		);
		expect(c.headline).toEqual({
			text: 'One element has a risk of damp or mould: see what to do next below.',
			tone: 'fail'
		});
		expect(c.table.rows[0].moisture).toEqual({ text: 'Risk of mould on the inside surface', tone: 'fail' });
		expect(c.moisture.paragraphs).toContainEqual({
			text: 'The inside surface of “Solid wall” may get cold and damp enough for mould to grow, most of all in December.',
			tone: 'fail'
		});
		expect(c.nextSteps.items.map((i) => i.text)).toContain(
			'Ask your assessor how the inside surface of “Solid wall” can be kept warmer, usually with more insulation. Until then, heating and ventilating the rooms well lowers the risk of mould.'
		);
	});

	it('warns that condensate which does not dry out builds up, and says not to build it as described', () => {
		const c = clientSummary(
			input([
				wall('Timber wall', 0.22, 0.3, { condensation: 'accumulates' }),
				wall('Cavity wall', 0.28, 0.3, { condensation: 'dries' })
			])
		);
		expect(c.headline.tone).toBe('fail');
		expect(c.headline.text).toContain('One element has a risk of damp or mould');
		expect(c.table.rows[0].moisture).toEqual({
			text: 'Water builds up inside it year after year',
			tone: 'fail'
		});
		// condensate that dries out within the year is worth knowing, not a fault (ISO 13788:2012 clause 6,
		// as the technical pages apply it: evaporation within the year, from memory)
		expect(c.table.rows[1].moisture).toEqual({
			text: 'Some condensation inside in winter, which dries out',
			tone: 'caution'
		});
		const text = all(c);
		expect(text).toContain(
			'In “Timber wall” water forms inside the construction in the colder months and does not dry out by the end of the year, so it would build up year after year.'
		);
		expect(c.nextSteps.items[0].text).toMatch(/^Do not build “Timber wall” as described without advice\./);
		expect(c.nextSteps.items[0].text).toContain('a vapour control layer');
	});

	it('gives an element without a limit its figure without a verdict, and does not count it as failing', () => {
		const door = {
			name: 'Front door',
			kind: 'door',
			area: 2,
			heatFlow: 'horizontal',
			givenU: 1.8,
			u: 1.8,
			limit: null,
			result: null
		} satisfies ClientSummaryElement;
		const c = clientSummary(input([wall('Front wall', 0.28, 0.3), door]));
		expect(c.table.rows[1]).toEqual({
			name: 'Front door',
			kind: 'Door',
			u: '1.80',
			limit: 'none set',
			verdict: { text: 'no limit set', tone: 'none' },
			moisture: { text: 'not checked (U-value given, not calculated)', tone: 'none' }
		});
		expect(c.headline.tone).toBe('pass');
		const text = all(c);
		expect(text).toContain(
			'No limit is set for “Front door” in the limit table used, so its figure is given without a verdict.'
		);
		expect(text).toContain('“Front door” uses a given figure and is not checked for damp or mould here.');
		expect(text).toContain('Ask your assessor whether another requirement applies to “Front door”');
	});

	it('says why a floor on the ground or an element without climate data was not checked', () => {
		const floor = {
			name: 'Ground floor',
			kind: 'ground-floor',
			area: 40,
			heatFlow: 'downward',
			u: 0.17,
			limit: 0.25,
			result: result({ u: 0.17, condensation: null, ground: true })
		} satisfies ClientSummaryElement;
		const c = clientSummary(
			input([floor, wall('Garage wall', 0.28, 0.3, { condensation: null, surface: null })])
		);
		expect(c.table.rows[0].moisture.text).toBe(
			'No mould risk found; condensation inside not checked (floor on the ground)'
		);
		expect(c.table.rows[1].moisture.text).toBe('not checked (no climate data)');
		const text = all(c);
		expect(text).toContain('the method does not apply to a floor lying on the ground');
		expect(text).toContain('“Garage wall” was not checked for damp or mould, because no climate data');
	});

	it('carries the cautions, and marks a draft as not issued', () => {
		const c = clientSummary(
			input([wall('Front wall', 0.28, 0.3)], { draft: true, verifyUrl: null, verificationCode: null })
		);
		expect(c.cautions.items).toBe(CLIENT_CAUTIONS);
		const cautions = c.cautions.items.join(' ');
		// steady-state; the Glaser method's limits; support, not replace, professional judgement; local
		// codes and a licensed practitioner decide (the cautions every result carries, common practice)
		expect(cautions).toContain('steady-state');
		expect(cautions).toContain('the Glaser method');
		expect(cautions).toContain('support, and do not replace, the judgement of a qualified professional');
		expect(cautions).toContain('local building codes');
		expect(cautions).toContain('licensed practitioner');
		expect(c.intro).toContain('This is a draft. It has not been issued and cannot be checked as genuine.');
		expect(all(c)).not.toContain('/verify/');
	});

	it('reads a single element of an element report', () => {
		const c = clientSummary(input([wall('Front wall', 0.28, 0.3)], { scope: 'element' }));
		expect(c.assessed.paragraphs[0]).toBe(
			'This report looks at one part of the home’s outer shell (an element): “Front wall”, an outside wall.'
		);
		expect(c.title).toBe('Front wall in plain words');
	});
});
