/**
 * Junctions built from a dwelling's elements: the person picks the junction type and the elements
 * that meet there (their stored build-ups), the builder makes the two-dimensional model of
 * ISO 10211 — rectangles of material, boundaries facing inside and outside with ISO 6946's surface
 * resistances, cut-off planes, flanks with their U and lengths in the chosen dimension system — and
 * its twin for the surface check (ISO 13788's Rsi on every inside surface). Pure: the page (in a
 * worker) and the server build the same model from the same choices.
 */
import { GROUND_LAMBDA_DEFAULT, RSE, RSI, RSI_SURFACE_CHECK } from '$lib/physics';
import type { JunctionFlank, JunctionInput, JunctionRegion } from '$lib/physics/junction-schema';
import type { FieldIssue } from '$lib/validation';
import type { DimensionSystem, JunctionType } from './kinds';
import type { JunctionDetails } from './schema';
import { layerDepth, modelElement, type BuilderElement, type ModelledElement } from './builder-layers';
import {
	cornerShape,
	cutOff,
	straightShape,
	type Box,
	type Envs,
	type Shape,
	type ShapeEnvironment
} from './builder-shapes';
import {
	groundFloorShape,
	intermediateFloorShape,
	partyWallShape,
	roofShape,
	windowShape
} from './builder-sections';

export type { BuilderElement } from './builder-layers';
export { cutOff } from './builder-shapes';

/** The builder's types: every junction type but the free-form one, and a straight wall (a reference, ψ = 0). */
export type BuilderType = Exclude<JunctionType, 'other'> | 'straight';

export interface BuildRequest {
	type: BuilderType;
	elements: { a?: BuilderElement | null; b?: BuilderElement | null };
	details: Omit<JunctionDetails, 'mode' | 'elements'>;
	dimensionSystem: DimensionSystem;
	/** design temperatures of the model, °C (ψ and fRsi do not depend on them) */
	temperatures: { inside: number; outside: number };
}

export interface BuiltJunction {
	/** the model for ψ, with the flanks of the chosen dimension system */
	model: JunctionInput;
	flanksBySystem: Record<DimensionSystem, JunctionFlank[]>;
	view: Box;
	/** warm environments whose surfaces the fRsi check leaves out (a window's panel) */
	glazing: string[];
	notes: string[];
}

export type BuildOutcome = { ok: true; built: BuiltJunction } | { ok: false; issues: FieldIssue[] };

/** Window U taken when no window element is picked, W/(m²·K). */
export const WINDOW_U_DEFAULT = 1.4; // common practice, no source (a double-glazed window of today)
export const WINDOW_PANEL_MM_DEFAULT = 70; // common practice, no source (a frame's depth)
/** Intermediate floor slab when none is given: 200 mm of reinforced concrete. */
export const FLOOR_SLAB_DEFAULT = { thicknessMm: 200, lambda: 2.3 }; // λ: ISO 10456 table, reinforced concrete with 1 % steel, from memory
/** Floor surface above the ground outside, and wall below the floor, when not given, mm. */
export const GROUND_DEFAULT = { floorAboveGroundMm: 150, wallBelowFloorMm: 500 }; // common practice, no source

/** The inside face of a window's panel: warm, but not an opaque surface of the fRsi check. */
export const GLAZING_ENVIRONMENT = 'inside (window)';

/** Environments named once, each with its surface resistance; inside ones are warm. */
function environments(): Envs {
	const all: Record<string, ShapeEnvironment> = {};
	const add = (name: string, warm: boolean, rs: number) => {
		all[name] ??= { warm, rs };
		return name;
	};
	return {
		all,
		inside: add('inside', true, RSI.horizontal),
		glazing: () => add(GLAZING_ENVIRONMENT, true, RSI.horizontal),
		insideAt: (d) => add(d === 'upward' ? 'inside (ceiling)' : 'inside (floor surface)', true, RSI[d]),
		out: (e) => add(e.rse === RSE ? 'outside' : `outside (Rse ${e.rse})`, false, e.rse),
		roofSpace: (e) => add('roof space', false, RSE + e.roofSpaceR)
	};
}

type Picked = { a: ModelledElement; b: ModelledElement | null; notes: string[] };

const ROLE_KINDS: Record<BuilderType, [string[], string[] | null, boolean]> = {
	straight: [['external-wall'], null, false],
	'external-corner': [['external-wall'], ['external-wall'], true],
	'internal-corner': [['external-wall'], ['external-wall'], true],
	'ground-floor': [['external-wall'], ['ground-floor'], false],
	'intermediate-floor': [['external-wall'], null, false],
	eaves: [['external-wall'], ['pitched-roof-ceiling'], false],
	'flat-roof': [['external-wall'], ['flat-roof'], false],
	'window-head': [['external-wall'], ['window'], true],
	'window-jamb': [['external-wall'], ['window'], true],
	'window-sill': [['external-wall'], ['window'], true],
	'party-wall': [['external-wall'], ['party-wall'], false]
};

const B_HEAT_FLOW = { 'ground-floor': 'downward', eaves: 'upward', 'flat-roof': 'upward' } as const;

/** The picked elements, checked against the type's roles and modelled as layers. */
function pick(req: BuildRequest): { ok: true; picked: Picked } | { ok: false; issues: FieldIssue[] } {
	const [kindsA, kindsB, bOptional] = ROLE_KINDS[req.type];
	const issues: FieldIssue[] = [];
	const a = req.elements.a;
	if (!a) issues.push({ path: 'details.elements.a', message: 'is required: pick the wall' });
	else if (!kindsA.includes(a.kind))
		issues.push({
			path: 'details.elements.a',
			message: `must be an external wall, got “${a.name}” (${a.kind})`
		});
	const b = req.elements.b ?? (bOptional && kindsB?.[0] === 'external-wall' ? a : null);
	if (kindsB && !b && !bOptional)
		issues.push({
			path: 'details.elements.b',
			message: `is required: pick the ${kindsB[0].replace('-', ' ')}`
		});
	else if (kindsB && b && !kindsB.includes(b.kind))
		issues.push({
			path: 'details.elements.b',
			message: `must be a ${kindsB.join(' or ')}, got “${b.name}” (${b.kind})`
		});
	if (req.type === 'eaves' && req.elements.b?.kind === 'pitched-roof-rafters')
		issues[issues.length - 1].message += ': a roof insulated at the rafters slopes, model it free-form';
	if (issues.length || !a) return { ok: false, issues };
	const ma = modelElement(a, 'details.elements.a', {
		heatFlow: 'horizontal',
		insulationLayer: req.details.insulationLayer
	});
	if (!ma.ok) return ma;
	if (!b || b.kind === 'window')
		return { ok: true, picked: { a: ma.element, b: null, notes: ma.element.notes } };
	const heatFlow = (B_HEAT_FLOW as Record<string, 'upward' | 'downward'>)[req.type] ?? 'horizontal';
	const mb = b === a ? ma : modelElement(b, 'details.elements.b', { heatFlow });
	if (!mb.ok) return mb;
	const notes = mb === ma ? ma.element.notes : [...ma.element.notes, ...mb.element.notes];
	return { ok: true, picked: { a: ma.element, b: mb.element, notes } };
}

/** The shape of the request's type from its modelled elements. */
function shapeOf(req: BuildRequest, p: Picked, env: Envs): Shape | FieldIssue[] {
	const d = req.details;
	const a = p.a;
	switch (req.type) {
		case 'straight':
			return straightShape(a, env);
		case 'external-corner':
		case 'internal-corner':
			return cornerShape(a, p.b ?? a, req.type === 'external-corner', env);
		case 'ground-floor':
			return groundFloorShape(
				a,
				p.b!,
				{
					...GROUND_DEFAULT,
					...d.ground,
					groundLambda: req.elements.b?.groundLambda ?? GROUND_LAMBDA_DEFAULT
				},
				env
			);
		case 'intermediate-floor':
			return intermediateFloorShape(a, d.floorSlab ?? FLOOR_SLAB_DEFAULT, env);
		case 'eaves':
		case 'flat-roof':
			return roofShape(a, p.b!, d.overWallMm ?? a.thicknessMm, req.type === 'eaves', env);
		case 'party-wall':
			return partyWallShape(a, p.b!, env);
		default:
			return windowOf(req, a, env);
	}
}

function windowOf(req: BuildRequest, a: ModelledElement, env: Envs): Shape | FieldIssue[] {
	const uWindow = req.elements.b?.givenU ?? WINDOW_U_DEFAULT;
	const thicknessMm = req.details.window?.thicknessMm ?? WINDOW_PANEL_MM_DEFAULT;
	const issues: FieldIssue[] = [];
	if (!(1 / uWindow - RSI.horizontal - RSE > 0.001))
		issues.push({
			path: 'details.elements.b',
			message: `the window's U (${uWindow}) is too high for a panel with Rsi ${RSI.horizontal} and Rse ${RSE}`
		});
	if (thicknessMm > a.thicknessMm)
		issues.push({
			path: 'details.window.thicknessMm',
			message: `must not exceed the wall's ${a.thicknessMm} mm`
		});
	if (issues.length) return issues;
	const fallback = Math.min(layerDepth(a, a.insulation)[0], a.thicknessMm - thicknessMm);
	const positionMm = req.details.window?.positionMm ?? fallback;
	if (positionMm + thicknessMm > a.thicknessMm)
		return [
			{
				path: 'details.window.positionMm',
				message: `puts the panel outside the wall: at most ${a.thicknessMm - thicknessMm} mm for a ${thicknessMm} mm panel`
			}
		];
	const at = req.type === 'window-head' ? 'head' : req.type === 'window-sill' ? 'sill' : 'jamb';
	return windowShape(a, { uWindow, thicknessMm, positionMm, at }, env);
}

/** A rectangle in the first element's frame: `s` along it from the junction plane, `d` from its inside face. */
function inFrame(
	shape: Shape,
	name: string,
	s: [number, number],
	d: [number, number],
	lambda: number
): JunctionRegion {
	const { p0, along, out } = shape.frame;
	const at = (si: number, di: number) => [
		p0[0] + si * along[0] + di * out[0],
		p0[1] + si * along[1] + di * out[1]
	];
	const [x0, y0] = at(s[0], d[0]);
	const [x1, y1] = at(s[1], d[1]);
	const r = (v: number) => Math.round(v * 1000) / 1000;
	return {
		name,
		x0: r(Math.min(x0, x1)),
		x1: r(Math.max(x0, x1)),
		y0: r(Math.min(y0, y1)),
		y1: r(Math.max(y0, y1)),
		lambda
	};
}

const clip = (s: [number, number], range: [number, number]): [number, number] | null => {
	const lo = Math.max(s[0], range[0]);
	const hi = Math.min(s[1], range[1]);
	return hi - lo >= 0.001 ? [lo, hi] : null;
};

/** The gap in the insulation and the insert, clipped to the first element, as regions painted last. */
function detailRegions(
	req: BuildRequest,
	shape: Shape,
	a: ModelledElement
): { regions: JunctionRegion[]; issues: FieldIssue[]; notes: string[] } {
	const regions: JunctionRegion[] = [];
	const issues: FieldIssue[] = [];
	const notes: string[] = [];
	const { gap, insert } = req.details;
	if (gap) {
		const s = clip(shape.gapSpan(gap.widthMm), shape.frame.range);
		const [d0, d1] = layerDepth(a, a.insulation);
		if (!s) issues.push({ path: 'details.gap.widthMm', message: 'leaves no gap within the wall' });
		else {
			regions.push(inFrame(shape, `Gap in ${a.layers[a.insulation].name}`, s, [d0, d1], gap.lambda));
			notes.push(
				`A ${gap.widthMm} mm gap in “${a.layers[a.insulation].name}” at the junction, filled with λ ${gap.lambda} W/(m·K).`
			);
		}
	}
	if (insert) {
		const s = clip([insert.alongFromMm, insert.alongFromMm + insert.lengthMm], shape.frame.range);
		const d = clip([insert.depthFromMm, insert.depthToMm], [0, a.thicknessMm]);
		if (!s)
			issues.push({
				path: 'details.insert.alongFromMm',
				message: `puts the insert beyond the wall (it runs ${shape.frame.range[0]} to ${shape.frame.range[1]} mm along from the junction)`
			});
		else if (!d)
			issues.push({
				path: 'details.insert.depthFromMm',
				message: `puts the insert outside the wall's ${a.thicknessMm} mm`
			});
		else {
			regions.push(inFrame(shape, insert.name, s, d, insert.lambda));
			notes.push(
				`“${insert.name}”: λ ${insert.lambda} W/(m·K), ${(s[1] - s[0]).toFixed(0)} mm along the wall from ${s[0].toFixed(0)} mm, ${d[0]}–${d[1]} mm from its inside face.`
			);
		}
	}
	return { regions, issues, notes };
}

/**
 * Build the ψ model of a junction from its elements and choices (ISO 10211), or say which choice is
 * at fault. Environments at the inside temperature are warm; fRsi is taken on their surfaces.
 */
export function buildJunction(req: BuildRequest): BuildOutcome {
	const picked = pick(req);
	if (!picked.ok) return picked;
	const env = environments();
	const shape = shapeOf(req, picked.picked, env);
	if (Array.isArray(shape)) return { ok: false, issues: shape };
	const extra = detailRegions(req, shape, picked.picked.a);
	if (extra.issues.length) return { ok: false, issues: extra.issues };
	const t = req.temperatures;
	const model: JunctionInput = {
		regions: [...shape.regions, ...extra.regions],
		boundaries: shape.boundaries,
		environments: Object.fromEntries(
			Object.entries(shape.environments).map(([n, e]) => [
				n,
				{ temperature: e.warm ? t.inside : t.outside, rs: e.rs }
			])
		),
		flanks: shape.flanks[req.dimensionSystem]
	};
	const notes = [
		`Cut-off planes ${cutOffText(picked.picked)} from the junction: at least 1 m, or three times the flanking element's thickness if more (ISO 10211, as recalled).`,
		'Flank U-values are those of the layers as modelled, U = 1/(Rsi + Σd/λ + Rse) with ISO 6946 surface resistances; the element’s own U (combined method, corrections) can differ.',
		...shape.notes,
		...picked.picked.notes,
		...extra.notes
	];
	const glazing = GLAZING_ENVIRONMENT in model.environments ? [GLAZING_ENVIRONMENT] : [];
	return { ok: true, built: { model, flanksBySystem: shape.flanks, view: shape.view, glazing, notes } };
}

function cutOffText(p: Picked): string {
	const parts = [p.a, p.b].filter((e): e is ModelledElement => e !== null);
	return [...new Set(parts)]
		.map((e) => `${(cutOff(e.thicknessMm) / 1000).toFixed(2)} m (${e.name})`)
		.join(', ');
}

/**
 * The twin of a model for the surface check (ISO 13788): every environment at the warmest
 * temperature but the `glazing` ones takes Rsi = 0.25 m²·K/W (glazing keeps its own, as recalled of
 * ISO 13788 4.3); no flanks. Returns the model and the environments whose surfaces are checked.
 */
export function surfaceModel(
	model: JunctionInput,
	glazing: readonly string[] = []
): { model: JunctionInput; checked: string[] } {
	const warm = Math.max(...Object.values(model.environments).map((e) => e.temperature));
	const checked = Object.keys(model.environments).filter(
		(n) => model.environments[n].temperature === warm && !glazing.includes(n)
	);
	const environments = Object.fromEntries(
		Object.entries(model.environments).map(([n, e]) => [
			n,
			checked.includes(n) ? { ...e, rs: RSI_SURFACE_CHECK } : e
		])
	);
	const twin: JunctionInput = { regions: model.regions, boundaries: model.boundaries, environments };
	if (model.maxCellMm !== undefined) twin.maxCellMm = model.maxCellMm;
	return { model: twin, checked };
}
