import { describe, expect, it } from 'vitest';
import {
	fieldLabel,
	issuesSummary,
	issuesWithoutField,
	issueText,
	shownIssues,
	type Issue
} from '../../../src/lib/components/dwellings/element-issues';
import {
	blankRow,
	buildUpFromRows,
	groundText,
	parseNumber,
	type EditRow
} from '../../../src/lib/dwellings/editor';
import { validateElement } from '../../../src/lib/dwellings/schema';

// Every message is produced the way the element page produces it: rows as typed, turned into the
// stored build-up by the editor's own helpers, checked by the real schema (`validateElement`, the
// same check the server makes). The words expected are the screen's own labels (no external source).

const brick = (over: Partial<EditRow> = {}) =>
	blankRow({ name: 'Brick', thickness: '215', lambda: '0.77', mu: '10', ...over });

type Typed = {
	rows?: EditRow[];
	name?: string;
	kind?: string;
	area?: string;
	temp?: string;
	rh?: string;
	ground?: Partial<ReturnType<typeof groundText>>;
};

/** The element as the page sends it (as ElementDraft.fields builds it), checked; its issues. */
function issuesOf(t: Typed): Issue[] {
	const kind = t.kind ?? 'external-wall';
	const internal: Record<string, unknown> = { temperature: parseNumber(t.temp ?? '20') };
	if (t.rh !== undefined) internal.relativeHumidity = parseNumber(t.rh);
	else internal.humidityClass = 3;
	const fields = {
		name: t.name ?? 'Wall',
		kind,
		area: parseNumber(t.area ?? '20'),
		heatFlow: kind === 'ground-floor' ? 'downward' : 'horizontal',
		climateId: null,
		internal,
		buildUp: buildUpFromRows(t.rows ?? [brick()], '', '', {
			ground: kind === 'ground-floor' ? { ...groundText(undefined), ...t.ground } : null
		}),
		givenU: null,
		givenUSource: null
	};
	const r = validateElement(fields, null);
	return r.ok ? [] : r.issues;
}

/** What the page shows of each issue: its field's screen name and what to do. */
const shown = (t: Typed) => shownIssues(issuesOf(t)).map((i) => `${fieldLabel(i.path)}: ${i.message}`);

describe('field names as the screen labels them', () => {
	it('names layers by their number on screen and their fields by their column', () => {
		expect(fieldLabel('buildUp.layers.2.bridgeGeometry.widthMm')).toBe('Layer 3, member width');
		expect(fieldLabel('buildUp.layers.1.thicknessMm')).toBe('Layer 2, thickness');
		expect(fieldLabel('layers.0.bridge.fraction')).toBe('Layer 1, bridging fraction');
		expect(fieldLabel('layers.4.fasteners.areaMm2')).toBe('Layer 5, fastener diameter');
		expect(fieldLabel('buildUp.layers')).toBe('Build-up');
		expect(fieldLabel('buildUp')).toBe('Build-up');
		expect(fieldLabel('internal.temperature')).toBe('Inside temperature');
		expect(fieldLabel('buildUp.ground.perimeterM')).toBe('Exposed perimeter');
		expect(fieldLabel('(body)')).toBe('Element');
	});

	it('a field no table names still comes out in words, never as a dotted path', () => {
		expect(fieldLabel('buildUp.ground.suspended.somethingNewM2')).toBe(
			'Ground, suspended, something new (m²)'
		);
		expect(fieldLabel('layers.0.somethingElse.innerValueMm')).toBe(
			'Layer 1, something else, inner value (mm)'
		);
	});
});

describe('messages from the real schema, in words that say what to do', () => {
	it('a member width typed as text, layer 3: one message, labelled, with the unit and an example', () => {
		const rows = [
			brick(),
			brick({ name: 'Block' }),
			brick({
				name: 'Mineral wool',
				thickness: '100',
				lambda: '0.035',
				mu: '1',
				bridged: true,
				bridgeBy: 'geometry',
				bridgeLambda: '0.13',
				bridgeWidth: 'abc',
				bridgeCentres: '600'
			})
		];
		const raw = issuesOf({ rows });
		// the schema's own paths and words, as the API answers them
		expect(raw).toContainEqual({
			path: 'buildUp.layers.2.bridgeGeometry.widthMm',
			message: 'must be a number'
		});
		expect(raw.map((i) => i.path)).toContain('buildUp.layers.2.bridge.fraction');
		// the page: the fraction's message says nothing the width's does not
		expect(shown({ rows })).toEqual(['Layer 3, member width: enter a number in mm, e.g. 38']);
	});

	it('a bridging fraction left out', () => {
		const rows = [brick({ bridged: true, bridgeLambda: '0.13' })];
		expect(shown({ rows })).toEqual([
			'Layer 1, bridging fraction: give the bridging fraction, or the member width and centres in mm'
		]);
	});

	it('a thickness typed as text quotes it', () => {
		const rows = [brick(), brick({ thickness: 'abc' })];
		expect(shown({ rows })).toEqual([
			'Layer 2, thickness: enter a number in mm, e.g. 100 (“abc” is not a number)'
		]);
	});

	it('a thickness of zero', () => {
		expect(shown({ rows: [brick({ thickness: '0' })] })).toEqual([
			'Layer 1, thickness: enter a number above 0 mm'
		]);
	});

	it('no layers at all', () => {
		expect(shown({ rows: [] })).toEqual(['Build-up: add at least one layer (Add layer, or paste rows)']);
	});

	it('the inside temperature and the relative humidity typed as text', () => {
		expect(shown({ temp: 'abc' })).toEqual([
			'Inside temperature: enter a number in °C, e.g. 20 (“abc” is not a number)'
		]);
		expect(shown({ rh: '150' })).toEqual(['Relative humidity: enter a number over 0 and at most 100 %']);
	});

	it('an area left empty, a name left empty', () => {
		expect(shown({ area: '' })).toEqual(['Area: enter a number in m², e.g. 12.5']);
		expect(shown({ name: '' })).toEqual(['Name: enter a name for the element']);
	});

	it('a λ left out of a material layer', () => {
		expect(shown({ rows: [brick({ lambda: '' })] })).toEqual([
			'Layer 1, λ: give λ or the thermal resistance'
		]);
	});

	it('a ground floor without its exposed perimeter', () => {
		expect(
			shown({ kind: 'ground-floor', rows: [brick({ name: 'Slab', thickness: '150', lambda: '1.13' })] })
		).toEqual(['Exposed perimeter: enter the exposed perimeter of the floor in m']);
	});

	it('the "Not saved" line names the fields in the same words', () => {
		const rows = [brick({ thickness: 'abc' }), brick({ lambda: '' })];
		expect(issuesSummary(issuesOf({ rows }))).toBe(
			'Layer 1, thickness: enter a number in mm, e.g. 100 (“abc” is not a number); Layer 2, λ: give λ or the thermal resistance.'
		);
	});

	it('the list under the form keeps its paths for placing, and shows labels', () => {
		const issues = shownIssues([{ path: 'climateId', message: 'must be an id' }]);
		expect(issuesWithoutField(issues)).toEqual([{ path: 'climateId', message: 'choose one from the list' }]);
	});

	it('reworded text does not change when reworded again', () => {
		const once = issueText('layers.0.thicknessMm', 'must be a finite number, got the text "x"');
		expect(issueText('layers.0.thicknessMm', once)).toBe(once);
	});
});

describe('no message the element page shows contains a dotted path or an internal name', () => {
	// A sweep of bad inputs over every field the editor sends.
	const bad = ['abc', '-1', '0', '1e9', ''];
	const cases: Typed[] = [];
	const rowFields: (keyof EditRow)[] = [
		'thickness',
		'lambda',
		'mu',
		'bridgeLambda',
		'bridgeFraction',
		'bridgeWidth',
		'bridgeCentres',
		'bridgeMu',
		'fastenerLambda',
		'fastenerDiameter',
		'fastenerPerM2',
		'fastenerPenetration',
		'density',
		'specificHeat',
		'resistance',
		'opening'
	];
	for (const v of bad) {
		for (const f of rowFields) {
			for (const bridgeBy of ['fraction', 'geometry'] as const)
				cases.push({
					rows: [
						brick({
							[f]: v,
							bridged: f.startsWith('bridge'),
							bridgeBy,
							bridgeLambda: f === 'bridgeLambda' ? v : '0.13',
							fasteners: f.startsWith('fastener'),
							fastenerRecessed: f === 'fastenerPenetration',
							mode: f === 'resistance' ? 'resistance' : f === 'opening' ? 'air' : 'lambda',
							air: 'slightly-ventilated'
						} as Partial<EditRow>)
					]
				});
		}
		cases.push({ area: v }, { temp: v }, { rh: v }, { name: v === '' ? '' : 'x'.repeat(200) });
		for (const g of ['perimeter', 'area', 'lambda', 'wall'] as const)
			cases.push({
				kind: 'ground-floor',
				rows: [brick({ name: 'Slab', thickness: '150', lambda: '1.13' })],
				ground: { perimeter: '30', [g]: v, soil: g === 'lambda' ? 'value' : '' }
			});
		cases.push({
			kind: 'ground-floor',
			rows: [brick({ name: 'Slab' })],
			ground: { perimeter: '30', floor: 'suspended', height: v, underfloorWallU: v, openings: v, wind: v }
		});
	}
	cases.push({ rows: [] });

	it('holds over the sweep', () => {
		let seen = 0;
		const all = new Set<string>();
		for (const c of cases) {
			for (const text of shown(c)) {
				seen++;
				if (process.env.SHOW_MESSAGES) all.add(text);
				const plain = text.replace(/e\.g\./g, '').replace(/\d+\.\d+/g, '1');
				expect(plain, text).not.toMatch(/[A-Za-z_]\.[A-Za-z0-9_]/);
				// camelCase internal names (widthMm, perimeterM, relativeHumidity)
				expect(text, text).not.toMatch(/\b[a-z]{2,}[A-Z][A-Za-z0-9]*\b/);
				expect(text, text).not.toMatch(/^\(body\)|^\(input\)|buildUp|layers\./);
			}
		}
		if (process.env.SHOW_MESSAGES) console.log([...all].sort().join('\n'));
		expect(seen).toBeGreaterThan(40);
	});
});
