/**
 * Pure helpers of the build-up editor: rows as the person types them (text, so "0,035" and half-typed
 * numbers survive) to stored layers and back, and rows pasted from a spreadsheet.
 */
import Papa from 'papaparse';
import type {
	StoredBuildUp,
	StoredGround,
	StoredLayer,
	StoredUnheatedSpace
} from '$lib/dwellings/element-input';
import type { ElementKind } from '$lib/dwellings/kinds';
import { GROUND_LAMBDA, groundKindOf, type GroundKind, type Layer, type RoofSpace } from '$lib/physics';
import type { AirtightnessType } from '$lib/physics/unheated-space';

/**
 * Kinds whose own plane may be inclined, and so take an inclination (ISO 6946:2017, 6.8, note to
 * Table 7): a roof insulated at the rafters and a flat roof (with its fall). A ceiling under a roof
 * space is flat whatever the roof's pitch; walls and floors have their direction from their kind.
 */
export const INCLINATION_KINDS: readonly ElementKind[] = ['pitched-roof-rafters', 'flat-roof'];

export type LayerMode = 'lambda' | 'resistance' | 'air';
export type AirKind = 'unventilated' | 'slightly-ventilated' | 'well-ventilated';

export type EditRow = {
	key: number;
	name: string;
	thickness: string;
	mode: LayerMode;
	lambda: string;
	resistance: string;
	air: AirKind;
	opening: string;
	vapour: 'mu' | 'sd';
	mu: string;
	sd: string;
	bridged: boolean;
	bridgeBy: 'fraction' | 'geometry';
	bridgeName: string;
	bridgeLambda: string;
	bridgeFraction: string;
	bridgeWidth: string;
	bridgeCentres: string;
	bridgeMu: string;
	/** the library material the bridging values came from, when picked there */
	bridgeMaterialId?: string;
	bridgeMaterialRevisionId?: string;
	bridgeMaterialCode?: string;
	/** ISO 6946 air-gap correction level: '' not given, or 0 / 1 / 2 */
	airGapLevel: '' | '0' | '1' | '2';
	fasteners: boolean;
	fastenerLambda: string;
	fastenerDiameter: string;
	fastenerPerM2: string;
	fastenerRecessed: boolean;
	fastenerPenetration: string;
	materialId?: string;
	materialRevisionId?: string;
	materialCode?: string;
	/** what is usual for the layer's library material (for plausibility warnings), copied when it is picked */
	plausible?: Layer['plausible'];
	/** density ρ, kg/m³, and specific heat capacity c, J/(kg·K): for the heat storage (ISO 13786) */
	density: string;
	specificHeat: string;
};

let nextKey = 1;
export const newKey = () => nextKey++;

export function blankRow(over: Partial<EditRow> = {}): EditRow {
	return {
		key: newKey(),
		name: '',
		thickness: '',
		mode: 'lambda',
		lambda: '',
		resistance: '',
		air: 'unventilated',
		opening: '',
		vapour: 'mu',
		mu: '',
		sd: '',
		bridged: false,
		bridgeBy: 'fraction',
		bridgeName: '',
		bridgeLambda: '',
		bridgeFraction: '',
		bridgeWidth: '',
		bridgeCentres: '',
		bridgeMu: '',
		airGapLevel: '',
		fasteners: false,
		fastenerLambda: '',
		fastenerDiameter: '',
		fastenerPerM2: '',
		fastenerRecessed: false,
		fastenerPenetration: '',
		density: '',
		specificHeat: '',
		...over
	};
}

const str = (v: number | undefined | null) => (v === undefined || v === null ? '' : String(v));
const roundTo = (v: number, d: number) => Math.round(v * 10 ** d) / 10 ** d;

/** Cross-section of a round fastener from its diameter, mm². */
export const fastenerArea = (diameterMm: number) => (Math.PI * diameterMm * diameterMm) / 4;

/** True while a row has nothing typed in it (a fresh blank row). */
export function isUntouchedRow(r: EditRow): boolean {
	const b = blankRow();
	return (Object.keys(b) as (keyof EditRow)[]).every((k) => k === 'key' || r[k] === b[k]);
}

/**
 * A number from what was typed: '' is absent; a decimal comma is accepted; anything else that is not
 * a number is passed on as the text, so the schema names the field and quotes the text.
 */
export function parseNumber(text: string): number | string | undefined {
	const t = text.trim().replace(/\s+/g, '');
	if (t === '') return undefined;
	const n = Number(t.replace(',', '.'));
	return Number.isFinite(n) ? n : text.trim();
}

export function rowFromLayer(l: StoredLayer): EditRow {
	const mode: LayerMode = l.air ? 'air' : l.resistance !== undefined ? 'resistance' : 'lambda';
	return blankRow({
		name: l.name,
		thickness: str(l.thicknessMm),
		mode,
		lambda: str(l.lambda),
		resistance: str(l.resistance),
		air: l.air ?? 'unventilated',
		opening: str(l.openingAreaMm2),
		vapour: l.sd !== undefined ? 'sd' : 'mu',
		mu: str(l.mu),
		sd: str(l.sd),
		bridged: Boolean(l.bridge),
		bridgeBy: l.bridgeGeometry ? 'geometry' : 'fraction',
		bridgeName: l.bridge?.name ?? '',
		bridgeLambda: str(l.bridge?.lambda),
		bridgeFraction: l.bridgeGeometry ? '' : str(l.bridge?.fraction),
		bridgeWidth: str(l.bridgeGeometry?.widthMm),
		bridgeCentres: str(l.bridgeGeometry?.centresMm),
		bridgeMu: str(l.bridge?.mu),
		bridgeMaterialId: l.bridge ? l.bridgeMaterial?.materialId : undefined,
		bridgeMaterialRevisionId: l.bridge ? l.bridgeMaterial?.materialRevisionId : undefined,
		bridgeMaterialCode: l.bridge ? l.bridgeMaterial?.materialCode : undefined,
		airGapLevel: l.airGapLevel === undefined ? '' : (String(l.airGapLevel) as EditRow['airGapLevel']),
		fasteners: Boolean(l.fasteners),
		fastenerLambda: str(l.fasteners?.lambda),
		fastenerDiameter: l.fasteners
			? str(l.fastenerDiameterMm ?? roundTo(Math.sqrt((4 * l.fasteners.areaMm2) / Math.PI), 3))
			: '',
		fastenerPerM2: str(l.fasteners?.perM2),
		fastenerRecessed: l.fasteners?.penetrationMm !== undefined,
		fastenerPenetration: str(l.fasteners?.penetrationMm),
		materialId: l.materialId,
		materialRevisionId: l.materialRevisionId,
		materialCode: l.materialCode,
		plausible: l.plausible,
		density: str(l.density),
		specificHeat: str(l.specificHeat)
	});
}

/** The stored layer of a row (values that do not parse stay as text for the schema to report). */
export function layerFromRow(r: EditRow): StoredLayer {
	const layer: Record<string, unknown> = {
		name: r.name.trim() || 'Layer',
		thicknessMm: parseNumber(r.thickness)
	};
	if (r.mode === 'lambda') layer.lambda = parseNumber(r.lambda);
	else if (r.mode === 'resistance') layer.resistance = parseNumber(r.resistance);
	else {
		layer.air = r.air;
		layer.openingAreaMm2 = parseNumber(r.opening);
		const rFixed = parseNumber(r.resistance);
		if (rFixed !== undefined) layer.resistance = rFixed;
	}
	if (r.vapour === 'mu') layer.mu = parseNumber(r.mu);
	else layer.sd = parseNumber(r.sd);
	if (r.bridged) {
		const bridge: Record<string, unknown> = { lambda: parseNumber(r.bridgeLambda) };
		if (r.bridgeName.trim()) bridge.name = r.bridgeName.trim();
		const mu = parseNumber(r.bridgeMu);
		if (mu !== undefined) bridge.mu = mu;
		if (r.bridgeBy === 'fraction') bridge.fraction = parseNumber(r.bridgeFraction);
		else {
			const w = parseNumber(r.bridgeWidth);
			const c = parseNumber(r.bridgeCentres);
			layer.bridgeGeometry = { widthMm: w, centresMm: c };
			if (typeof w === 'number' && typeof c === 'number' && c > 0) bridge.fraction = w / c;
			else bridge.fraction = undefined;
		}
		layer.bridge = bridge;
		if (r.bridgeMaterialId) {
			const m: Record<string, unknown> = { materialId: r.bridgeMaterialId };
			if (r.bridgeMaterialRevisionId) m.materialRevisionId = r.bridgeMaterialRevisionId;
			if (r.bridgeMaterialCode) m.materialCode = r.bridgeMaterialCode;
			layer.bridgeMaterial = m;
		}
	}
	if (r.airGapLevel !== '') layer.airGapLevel = Number(r.airGapLevel);
	if (r.fasteners) {
		const dia = parseNumber(r.fastenerDiameter);
		const f: Record<string, unknown> = {
			lambda: parseNumber(r.fastenerLambda),
			areaMm2: typeof dia === 'number' ? fastenerArea(dia) : dia,
			perM2: parseNumber(r.fastenerPerM2)
		};
		if (r.fastenerRecessed) f.penetrationMm = parseNumber(r.fastenerPenetration);
		for (const k of Object.keys(f)) if (f[k] === undefined) delete f[k];
		layer.fasteners = f;
		if (typeof dia === 'number') layer.fastenerDiameterMm = dia;
	}
	if (r.materialId) layer.materialId = r.materialId;
	if (r.materialRevisionId) layer.materialRevisionId = r.materialRevisionId;
	if (r.materialCode) layer.materialCode = r.materialCode;
	if (r.plausible) layer.plausible = r.plausible;
	layer.density = parseNumber(r.density);
	layer.specificHeat = parseNumber(r.specificHeat);
	for (const k of Object.keys(layer)) if (layer[k] === undefined) delete layer[k];
	return layer as StoredLayer;
}

/**
 * How the ground's λ is chosen: not known (the conventional 2.0 W/(m·K)), a kind of ground from
 * ISO 13370's table, or a value typed in `lambda`.
 */
export type GroundSoil = '' | GroundKind | 'value';

/** Ground-floor inputs as typed (text); without `soil`, a λ typed is taken as a value. */
export type GroundText = {
	perimeter: string;
	area: string;
	soil?: GroundSoil;
	lambda: string;
	wall: string;
	/** a slab on the ground (the default) or a suspended floor over a ventilated space (ISO 13370, 8.2) */
	floor?: 'slab' | 'suspended' | 'heated-basement' | 'unheated-basement';
	/** suspended: the deck's height above the outside ground, mm */
	height?: string;
	/** suspended: U of the underfloor space's walls, W/(m²·K) */
	underfloorWallU?: string;
	/** suspended: ventilation openings, mm² per metre of exposed perimeter (stored as ε in m²/m) */
	openings?: string;
	/** suspended: wind speed at 10 m, m/s */
	wind?: string;
	shielding?: 'sheltered' | 'average' | 'exposed';
	/** basement: depth of its floor below the outside ground, mm (stored as z in m) */
	depth?: string;
	/** basement: resistance Rw of its walls in the ground, m²·K/W */
	basementWallR?: string;
	/** unheated basement: resistance Rf of its own floor, m²·K/W */
	basementFloorR?: string;
	/** unheated basement: height of its walls above the ground, mm (stored in m), and their U, W/(m²·K) */
	wallAboveHeight?: string;
	wallAboveU?: string;
	/** unheated basement: air change rate, h⁻¹, and air volume, m³ */
	basementAirChange?: string;
	basementVolume?: string;
	/** edge insulation of a slab: none, horizontal or vertical */
	edge?: '' | 'horizontal' | 'vertical';
	/** edge insulation: width (horizontal) or depth (vertical), mm, and thickness dn, mm (stored in m) */
	edgeWidth?: string;
	edgeThickness?: string;
	/** edge insulation: its resistance Rn (m²·K/W) or its λ (W/(m·K)) */
	edgeBy?: 'r' | 'lambda';
	edgeR?: string;
	edgeLambda?: string;
};

/** The floor types of a ground floor as the editor offers them. */
export type GroundFloorType = NonNullable<GroundText['floor']>;

export function groundText(g: StoredGround | undefined): GroundText {
	const lambda = g?.groundLambda;
	const kind = lambda === undefined ? null : groundKindOf(lambda);
	return {
		perimeter: str(g?.perimeterM),
		area: str(g?.areaM2),
		soil: lambda === undefined ? '' : (kind ?? 'value'),
		lambda: kind ? '' : str(lambda),
		// typed in mm like every other thickness, stored in m as ISO 13370 writes it
		wall: g?.wallThicknessM === undefined ? '' : String(Math.round(g.wallThicknessM * 1e6) / 1e3),
		floor: g?.suspended ? 'suspended' : 'slab',
		height: g?.suspended ? String(Math.round(g.suspended.heightM * 1e6) / 1e3) : '',
		underfloorWallU: str(g?.suspended?.underfloorWallU),
		openings: g?.suspended ? String(Math.round(g.suspended.openingsPerPerimeter * 1e9) / 1e3) : '',
		wind: str(g?.suspended?.windSpeed),
		shielding: g?.suspended?.windShielding ?? 'average',
		...basementText(g?.basement),
		...(g?.basement ? { floor: g.basement.kind === 'heated' ? 'heated-basement' : 'unheated-basement' } : {}),
		...edgeText(g?.edge)
	};
}

/** m as stored to mm as typed, without binary noise (0.3 → "300"). */
const mText = (m: number | undefined) => (m === undefined ? '' : String(Math.round(m * 1e6) / 1e3));

function basementText(b: StoredGround['basement']): Partial<GroundText> {
	return {
		depth: mText(b?.depthM),
		basementWallR: str(b?.wallR),
		basementFloorR: str(b?.floorR),
		wallAboveHeight: mText(b?.wallAboveGroundHeightM),
		wallAboveU: str(b?.wallAboveGroundU),
		basementAirChange: str(b?.airChangeRate),
		basementVolume: str(b?.volumeM3)
	};
}

function edgeText(e: StoredGround['edge']): Partial<GroundText> {
	return {
		edge: e?.orientation ?? '',
		edgeWidth: mText(e?.widthM),
		edgeThickness: mText(e?.insulationThicknessM),
		edgeBy: e?.insulationLambda !== undefined ? 'lambda' : 'r',
		edgeR: str(e?.insulationR),
		edgeLambda: str(e?.insulationLambda)
	};
}

/** The basement or the edge insulation of a ground floor as stored, from what was typed. */
function groundExtras(t: GroundText, g: Record<string, unknown>): void {
	const num = (v: string | undefined) => parseNumber(v ?? '');
	if (t.floor === 'heated-basement' || t.floor === 'unheated-basement') {
		const b: Record<string, unknown> = {
			kind: t.floor === 'heated-basement' ? 'heated' : 'unheated',
			depthM: mmToM(num(t.depth)),
			wallR: num(t.basementWallR)
		};
		if (t.floor === 'unheated-basement') {
			b.floorR = num(t.basementFloorR);
			b.wallAboveGroundHeightM = mmToM(num(t.wallAboveHeight));
			b.wallAboveGroundU = num(t.wallAboveU);
			b.airChangeRate = num(t.basementAirChange);
			b.volumeM3 = num(t.basementVolume);
		}
		g.basement = b;
	} else if ((t.floor ?? 'slab') === 'slab' && t.edge) {
		const e: Record<string, unknown> = {
			orientation: t.edge,
			widthM: mmToM(num(t.edgeWidth)),
			insulationThicknessM: mmToM(num(t.edgeThickness))
		};
		if (t.edgeBy === 'lambda') e.insulationLambda = num(t.edgeLambda);
		else e.insulationR = num(t.edgeR);
		g.edge = e;
	}
}

/**
 * Element kinds that may lie beside an unheated space (a garage, a stairwell, a sunspace, a loft
 * treated as a space): external walls, roofs and ceilings, exposed floors. A floor over an unheated
 * basement is a ground floor's type instead (ISO 13370, 8.4).
 */
export const UNHEATED_KINDS: readonly ElementKind[] = [
	'external-wall',
	'pitched-roof-ceiling',
	'pitched-roof-rafters',
	'flat-roof',
	'exposed-floor'
];

/** An outer element of the unheated space as typed. */
export type UnheatedElementText = { key: number; name: string; area: string; u: string };

/** The unheated space beside an element as typed (text), ISO 6946:2017, 6.10.3. */
export type UnheatedText = {
	/** whether the element lies beside an unheated space */
	on: boolean;
	/** Ai, m² ('' takes the element's area) */
	internalArea: string;
	elements: UnheatedElementText[];
	/** n given ('given') or ISO 13789's conventional value by airtightness */
	airBy: 'given' | AirtightnessType;
	airChange: string;
	volume: string;
};

/** A blank outer element of the unheated space. */
export const blankUnheatedElement = (): UnheatedElementText => ({
	key: newKey(),
	name: '',
	area: '',
	u: ''
});

export function unheatedText(s: StoredUnheatedSpace | undefined): UnheatedText {
	return {
		on: s !== undefined,
		internalArea: str(s?.internalAreaM2),
		elements: s?.externalElements.length
			? s.externalElements.map((e) => ({
					key: newKey(),
					name: e.name ?? '',
					area: str(e.areaM2),
					u: str(e.uValue)
				}))
			: [blankUnheatedElement()],
		airBy: s?.airtightness ?? 'given',
		airChange: str(s?.airChangeRate),
		volume: str(s?.volumeM3)
	};
}

/** The unheated space as stored, from what was typed; none when it is off. */
export function unheatedFromText(t: UnheatedText): StoredUnheatedSpace | undefined {
	if (!t.on) return undefined;
	const s: Record<string, unknown> = {
		externalElements: t.elements
			.filter((e) => e.name.trim() || e.area.trim() || e.u.trim())
			.map((e) => {
				const o: Record<string, unknown> = { areaM2: parseNumber(e.area), uValue: parseNumber(e.u) };
				if (e.name.trim()) o.name = e.name.trim();
				return o;
			}),
		volumeM3: parseNumber(t.volume)
	};
	const ai = parseNumber(t.internalArea);
	if (ai !== undefined) s.internalAreaM2 = ai;
	if (t.airBy === 'given') s.airChangeRate = parseNumber(t.airChange);
	else s.airtightness = t.airBy;
	return s as StoredUnheatedSpace;
}

/**
 * The element's fields with the unheated space beside it in the build-up, for the kinds that may
 * have one (and not with a roof space: that one keeps its table value).
 */
export function withUnheatedSpace<F extends { kind: ElementKind; buildUp: StoredBuildUp | null }>(
	fields: F,
	t: UnheatedText
): F {
	if (!fields.buildUp || !UNHEATED_KINDS.includes(fields.kind)) return fields;
	const s = unheatedFromText(t);
	if (!s) return fields;
	return { ...fields, buildUp: { ...fields.buildUp, unheatedSpace: s } };
}

/** The ground's λ as stored: none when not known, the table's value for a kind, else what was typed. */
function groundLambdaOf(g: GroundText): number | string | undefined {
	if (g.soil === '') return undefined;
	if (g.soil === undefined || g.soil === 'value') return parseNumber(g.lambda);
	return GROUND_LAMBDA[g.soil];
}

/** A thickness typed in mm, in m; text that is no number is passed on for the engine to name. */
function mmToM(v: number | string | undefined): number | string | undefined {
	return typeof v === 'number' ? v / 1000 : v;
}

export function buildUpFromRows(
	rows: EditRow[],
	rsi?: string,
	rse?: string,
	extras: { ground?: GroundText | null; roofSpace?: RoofSpace | '' | null; inclination?: string | null } = {}
): StoredBuildUp {
	const b: Record<string, unknown> = { layers: rows.map(layerFromRow) };
	const a = rsi === undefined ? undefined : parseNumber(rsi);
	const e = rse === undefined ? undefined : parseNumber(rse);
	if (a !== undefined) b.rsi = a;
	if (e !== undefined) b.rse = e;
	if (extras.ground) {
		// perimeterM is required: left blank it stays undefined and the schema says so.
		const g: Record<string, unknown> = {
			perimeterM: parseNumber(extras.ground.perimeter),
			areaM2: parseNumber(extras.ground.area),
			groundLambda: groundLambdaOf(extras.ground),
			wallThicknessM: mmToM(parseNumber(extras.ground.wall))
		};
		if (extras.ground.floor === 'suspended') {
			const openings = parseNumber(extras.ground.openings ?? '');
			g.suspended = {
				heightM: mmToM(parseNumber(extras.ground.height ?? '')),
				underfloorWallU: parseNumber(extras.ground.underfloorWallU ?? ''),
				// mm² per metre of perimeter → m²/m
				openingsPerPerimeter: typeof openings === 'number' ? openings / 1e6 : openings,
				windSpeed: parseNumber(extras.ground.wind ?? ''),
				windShielding: extras.ground.shielding ?? 'average'
			};
		}
		groundExtras(extras.ground, g);
		for (const k of Object.keys(g)) if (g[k] === undefined && k !== 'perimeterM') delete g[k];
		b.ground = g;
	}
	if (extras.roofSpace) b.roofSpace = extras.roofSpace;
	const inclination = extras.inclination ? parseNumber(extras.inclination) : undefined;
	if (inclination !== undefined) b.inclinationDeg = inclination;
	return b as StoredBuildUp;
}

/** Issues grouped by path for showing next to the field: `buildUp.layers.2.thicknessMm` → that cell. */
export function issuesByPath(issues: { path: string; message: string }[]): Record<string, string> {
	const out: Record<string, string> = {};
	for (const i of issues) {
		const p = i.path.replace(/^buildUp\./, '');
		out[p] ??= i.message;
	}
	return out;
}

export type PasteResult = { rows: EditRow[]; errors: string[] };

/**
 * Rows copied from a spreadsheet (tab-separated, or commas/semicolons): name, thickness in mm, λ in
 * W/(m·K), then optionally μ. A first row whose thickness is not a number is taken as a header.
 * Each bad line is named with its number and why; good lines are still returned.
 */
export function parsePastedRows(text: string): PasteResult {
	const parsed = Papa.parse<string[]>(text.trim(), { delimiter: '', skipEmptyLines: 'greedy' });
	const rows: EditRow[] = [];
	const errors: string[] = [];
	parsed.data.forEach((cells, i) => {
		const line = i + 1;
		const c = cells.map((x) => (x ?? '').trim());
		if (c.length < 3) {
			errors.push(
				`line ${line}: expected name, thickness (mm), λ (W/(m·K)) and optionally μ; found ${c.length} column${c.length === 1 ? '' : 's'}`
			);
			return;
		}
		const d = parseNumber(c[1]);
		const lambda = parseNumber(c[2]);
		const mu = c[3] !== undefined ? parseNumber(c[3]) : undefined;
		if (i === 0 && typeof d !== 'number') return; // header row
		if (!c[0]) errors.push(`line ${line}: the layer name is empty`);
		else if (typeof d !== 'number' || d <= 0)
			errors.push(`line ${line}: thickness “${c[1]}” is not a number of mm above 0`);
		else if (typeof lambda !== 'number' || lambda <= 0)
			errors.push(`line ${line}: λ “${c[2]}” is not a number above 0`);
		else if (mu !== undefined && (typeof mu !== 'number' || mu < 1))
			errors.push(`line ${line}: μ “${c[3]}” is not a number of at least 1`);
		else
			rows.push(
				blankRow({
					name: c[0],
					thickness: String(d),
					lambda: String(lambda),
					mu: mu === undefined ? '' : String(mu)
				})
			);
	});
	for (const e of parsed.errors) errors.push(`line ${(e.row ?? 0) + 1}: ${e.message}`);
	return { rows, errors };
}
