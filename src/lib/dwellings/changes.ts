/**
 * What differs between two states of a dwelling's technical record: the issued one (a report's snapshot)
 * and the working copy as it is now, or an element before and after one save. Pure, so the server, the
 * API and the pages list the same changes in the same words.
 *
 * Compared: each element (matched by id; added and removed ones too) with its name, kind, area,
 * heat-flow direction, given U and its source, climate (which one and its months), internal conditions,
 * build-up (every layer's name, thickness, λ, given resistance, vapour data, bridging, fasteners, library
 * revision; surface resistances, ground and roof-space inputs) and the U-value compared with the limit;
 * each junction (matched by id; added and removed ones too) with its name, type, length, dimension
 * system, where its ψ comes from, its ψ (as printed, to 3 decimals) and the source of an entered one,
 * and its build (the elements it was built from and every choice of the builder, or the free-form
 * model); and the dwelling's limit table (which one and its limits) and address. Who made each change
 * and when are added by the server from the activity log.
 */
import { fx, trim } from '$lib/format';
import { ELEMENT_KIND_LABELS, type ElementKind } from './kinds';
import { DIMENSION_SYSTEM_LABELS, JUNCTION_TYPE_LABELS } from '$lib/junctions/kinds';
import type { JunctionDetails } from '$lib/junctions/schema';
import type { JunctionFields } from '$lib/junctions/record';
import type { StoredBuildUp, StoredInternal, StoredLayer } from './element-input';

/** One element as both sides describe it (a report's snapshot element has this shape). */
export type ComparedElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: string;
	givenU?: number | null;
	givenUSource?: string | null;
	buildUp: StoredBuildUp | null;
	internal: StoredInternal | null;
	climate: {
		id: string;
		name: string;
		months: { month: number; temperature: number; relativeHumidity: number }[];
	} | null;
	u: number | null;
	materialRevisions: { layerIndex: number; revision: number; code: string | null }[];
};

/** One junction as both sides describe it (a report's snapshot junction has this shape). */
export type ComparedJunction = JunctionFields & {
	/** the computed model; compared for a free-form junction, whose build it is */
	model: unknown;
	/** ψ of the heat loss, W/(m·K) */
	psi: number | null;
};

export type ComparedRecord = {
	dwelling: { address: string };
	limitTable: { id: string; name: string; limits: Partial<Record<ElementKind, number>> } | null;
	elements: ComparedElement[];
	/** absent from records frozen before junctions were reported: taken as none */
	junctions?: ComparedJunction[];
};

/** One difference, in the screen's words: `before` and `after` are printable ("—" for none). */
export type Change = {
	/** the element it concerns, null for the dwelling itself (and for a junction) */
	elementId: string | null;
	/** how the change names what it concerns: the element, or "Name (junction)"; null for the dwelling */
	element: string | null;
	/** the junction it concerns, when it concerns one */
	junctionId?: string;
	field: string;
	before: string;
	after: string;
};

/** A change with who last changed that element (or the dwelling) after the issue, and when. */
export type AttributedChange = Change & { by: string | null; at: string | null };

/** The dwelling against its latest issued dwelling report. */
export type IssueChanges = {
	/** the latest issued dwelling report, null before the first issue */
	report: { id: string; number: string; revision: number; issuedAt: string } | null;
	changes: AttributedChange[];
};

const NONE = '—';

function text(v: unknown): string {
	if (v === null || v === undefined || v === '') return NONE;
	if (typeof v === 'number') return trim(v, 4);
	return String(v);
}

function same(a: unknown, b: unknown): boolean {
	return JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
}

/** Every difference between the issued record and the working copy, dwelling first, then by element. */
export function compareRecords(issued: ComparedRecord, current: ComparedRecord): Change[] {
	const changes: Change[] = [];
	const dwelling = (field: string, before: unknown, after: unknown) => {
		if (!same(before, after))
			changes.push({ elementId: null, element: null, field, before: text(before), after: text(after) });
	};
	dwelling('Address', issued.dwelling.address, current.dwelling.address);
	dwelling('Limit table', issued.limitTable?.name, current.limitTable?.name);
	if (issued.limitTable && current.limitTable && issued.limitTable.id === current.limitTable.id) {
		for (const kind of Object.keys(ELEMENT_KIND_LABELS) as ElementKind[]) {
			dwelling(
				`Limit for ${ELEMENT_KIND_LABELS[kind].toLowerCase()}`,
				issued.limitTable.limits[kind],
				current.limitTable.limits[kind]
			);
		}
	}
	const now = new Map(current.elements.map((e) => [e.id, e]));
	const then = new Map(issued.elements.map((e) => [e.id, e]));
	for (const before of issued.elements) {
		const after = now.get(before.id);
		if (!after) {
			changes.push({
				elementId: before.id,
				element: before.name,
				field: 'Element',
				before: 'present',
				after: 'removed'
			});
		} else changes.push(...compareElements(before, after));
	}
	for (const after of current.elements) {
		if (!then.has(after.id)) {
			changes.push({
				elementId: after.id,
				element: after.name,
				field: 'Element',
				before: 'absent',
				after: `added (${ELEMENT_KIND_LABELS[after.kind]})`
			});
		}
	}
	changes.push(...compareJunctionLists(issued, current));
	return changes;
}

const junctionLabel = (j: ComparedJunction) => `${j.name} (junction)`;

/** The junctions of the two records: removed, changed, then added ones. */
function compareJunctionLists(issued: ComparedRecord, current: ComparedRecord): Change[] {
	const changes: Change[] = [];
	const was = issued.junctions ?? [];
	const is = current.junctions ?? [];
	const now = new Map(is.map((j) => [j.id, j]));
	const then = new Set(was.map((j) => j.id));
	const names = new Map(
		[...issued.elements, ...current.elements].map((e) => [e.id, e.name] as [string, string])
	);
	for (const before of was) {
		const after = now.get(before.id);
		if (after) changes.push(...compareJunctions(before, after, names));
		else
			changes.push({
				elementId: null,
				junctionId: before.id,
				element: junctionLabel(before),
				field: 'Junction',
				before: 'present',
				after: 'removed'
			});
	}
	for (const after of is)
		if (!then.has(after.id))
			changes.push({
				elementId: null,
				junctionId: after.id,
				element: junctionLabel(after),
				field: 'Junction',
				before: 'absent',
				after: `added (${JUNCTION_TYPE_LABELS[after.type]})`
			});
	return changes;
}

/** What the builder's choices say, field by field, as the junction page names them. */
const DETAIL_FIELDS: { key: keyof JunctionDetails; label: string }[] = [
	{ key: 'insulationLayer', label: 'Main insulation layer' },
	{ key: 'gap', label: 'Gap in the insulation' },
	{ key: 'insert', label: 'Insert' },
	{ key: 'floorSlab', label: 'Floor slab' },
	{ key: 'window', label: 'Window panel' },
	{ key: 'ground', label: 'Ground levels' },
	{ key: 'overWallMm', label: 'Layers over the wall head (mm)' },
	{ key: 'internal', label: 'Inside conditions of the surface check' }
];

/**
 * The differences between two states of one junction (the earlier first); `names` names elements by id.
 * ψ is compared as printed, to 3 decimals, so that the same calculation repeated never counts.
 */
export function compareJunctions(
	before: ComparedJunction,
	after: ComparedJunction,
	names: ReadonlyMap<string, string> = new Map()
): Change[] {
	const changes: Change[] = [];
	const add = (field: string, a: unknown, b: unknown, show: (v: unknown) => string = text) => {
		if (!same(a, b))
			changes.push({
				elementId: null,
				junctionId: after.id,
				element: junctionLabel(after),
				field,
				before: show(a),
				after: show(b)
			});
	};
	add('Name', before.name, after.name);
	add('Type', JUNCTION_TYPE_LABELS[before.type], JUNCTION_TYPE_LABELS[after.type]);
	add('Length (m)', before.lengthM, after.lengthM);
	add(
		'Dimension system',
		DIMENSION_SYSTEM_LABELS[before.dimensionSystem],
		DIMENSION_SYSTEM_LABELS[after.dimensionSystem]
	);
	add('ψ from', before.source, after.source);
	add('ψ (W/(m·K))', fx(before.psi, 3), fx(after.psi, 3));
	add('Source of the entered ψ', before.psiSource, after.psiSource);
	const a = before.details;
	const b = after.details;
	add('Model', a?.mode ?? null, b?.mode ?? null);
	const element = (id: string | undefined) =>
		id ? (names.get(id) ?? 'an element no longer in the dwelling') : null;
	add('First element', element(a?.elements?.a), element(b?.elements?.a));
	add('Second element', element(a?.elements?.b), element(b?.elements?.b));
	for (const f of DETAIL_FIELDS) {
		const x = a?.[f.key];
		const y = b?.[f.key];
		add(f.label, x ?? null, y ?? null, (v) =>
			typeof v === 'number' && f.key === 'insulationLayer' ? `layer ${v + 1}` : describeJson(v)
		);
	}
	if ((a?.mode ?? 'free-form') === 'free-form' && (b?.mode ?? 'free-form') === 'free-form')
		add('Free-form model', before.model ?? null, after.model ?? null, () => 'changed');
	return changes;
}

/** The differences between two states of one element (the earlier first). */
export function compareElements(before: ComparedElement, after: ComparedElement): Change[] {
	const changes: Change[] = [];
	const add = (field: string, a: unknown, b: unknown, show: (v: unknown) => string = text) => {
		if (!same(a, b))
			changes.push({ elementId: after.id, element: after.name, field, before: show(a), after: show(b) });
	};
	add('Name', before.name, after.name);
	add('Kind', ELEMENT_KIND_LABELS[before.kind], ELEMENT_KIND_LABELS[after.kind]);
	add('Area (m²)', before.area, after.area);
	add('Heat-flow direction', before.heatFlow, after.heatFlow);
	add('Given U (W/(m²·K))', before.givenU, after.givenU);
	add('Source of the given U', before.givenUSource, after.givenUSource);
	add('Climate', before.climate?.name, after.climate?.name);
	if (before.climate && after.climate && before.climate.id === after.climate.id)
		add('Climate months', before.climate.months, after.climate.months, () => 'changed');
	add('Internal temperature (°C)', before.internal?.temperature, after.internal?.temperature);
	add('Internal relative humidity (%)', before.internal?.relativeHumidity, after.internal?.relativeHumidity);
	add('Humidity class', before.internal?.humidityClass, after.internal?.humidityClass);
	changes.push(...compareBuildUps(before, after));
	add('U-value (W/(m²·K))', before.u, after.u);
	return changes;
}

function compareBuildUps(before: ComparedElement, after: ComparedElement): Change[] {
	const changes: Change[] = [];
	const add = (field: string, a: unknown, b: unknown) => {
		if (!same(a, b))
			changes.push({ elementId: after.id, element: after.name, field, before: text(a), after: text(b) });
	};
	const a = before.buildUp;
	const b = after.buildUp;
	add('Rsi (m²·K/W)', a?.rsi, b?.rsi);
	add('Rse (m²·K/W)', a?.rse, b?.rse);
	add('Ground inputs', describeJson(a?.ground), describeJson(b?.ground));
	add('Roof space', a?.roofSpace, b?.roofSpace);
	add('Unheated space beside it', describeJson(a?.unheatedSpace), describeJson(b?.unheatedSpace));
	add('Other surface conditions', describeJson(a?.surfaceConditions), describeJson(b?.surfaceConditions));
	add('Inclination (°)', a?.inclinationDeg, b?.inclinationDeg);
	const la = a?.layers ?? [];
	const lb = b?.layers ?? [];
	add('Number of layers', la.length, lb.length);
	const revA = new Map(before.materialRevisions.map((r) => [r.layerIndex, r]));
	const revB = new Map(after.materialRevisions.map((r) => [r.layerIndex, r]));
	for (let i = 0; i < Math.min(la.length, lb.length); i++) {
		const prefix = `Layer ${i + 1}`;
		add(`${prefix}, material`, la[i].name, lb[i].name);
		add(`${prefix}, thickness (mm)`, la[i].thicknessMm, lb[i].thicknessMm);
		add(`${prefix}, λ (W/(m·K))`, la[i].lambda, lb[i].lambda);
		add(`${prefix}, library revision`, revisionText(revA.get(i)), revisionText(revB.get(i)));
		add(
			`${prefix}, bridging library material`,
			la[i].bridgeMaterial?.materialCode ?? la[i].bridgeMaterial?.materialId,
			lb[i].bridgeMaterial?.materialCode ?? lb[i].bridgeMaterial?.materialId
		);
		const rest = (l: StoredLayer) => {
			const {
				name: _n,
				thicknessMm: _t,
				lambda: _l,
				materialRevisionId: _r,
				materialId: _m,
				materialCode: _c,
				bridgeMaterial: _b,
				...others
			} = l;
			return others;
		};
		if (!same(rest(la[i]), rest(lb[i])))
			changes.push({
				elementId: after.id,
				element: after.name,
				field: `${prefix}, other properties`,
				before: describeJson(rest(la[i])),
				after: describeJson(rest(lb[i]))
			});
	}
	return changes;
}

function revisionText(r: { revision: number; code: string | null } | undefined): string {
	if (!r) return NONE;
	return r.code ? `${r.code}, revision ${r.revision}` : `revision ${r.revision}`;
}

/** The stored inputs' keys as the editor labels them. */
const KEY_LABELS: Record<string, string> = {
	resistance: 'R (m²·K/W)',
	air: 'air layer',
	openingAreaMm2: 'opening area (mm²)',
	mu: 'μ',
	sd: 'sd (m)',
	airGapLevel: 'air-gap level',
	bridge: 'bridging',
	bridgeGeometry: 'bridging geometry',
	fraction: 'fraction',
	lambda: 'λ (W/(m·K))',
	widthMm: 'width (mm)',
	centresMm: 'centres (mm)',
	name: 'material',
	fasteners: 'fasteners',
	fastenerDiameterMm: 'fastener diameter (mm)',
	perM2: 'per m²',
	areaMm2: 'cross-section (mm²)',
	penetrationMm: 'penetration (mm)',
	perimeterM: 'exposed perimeter (m)',
	areaM2: 'floor area (m²)',
	groundLambda: 'ground λ (W/(m·K))',
	wallThicknessM: 'wall thickness (m)'
};

/** A small object as "label value, label value" (resistance, vapour data, bridging, ground inputs…). */
function describeJson(v: unknown): string {
	if (v === null || v === undefined) return NONE;
	if (typeof v !== 'object') return text(v);
	const parts = Object.entries(v as Record<string, unknown>)
		.filter(([, x]) => x !== undefined && x !== null)
		.map(([k, x]) => `${KEY_LABELS[k] ?? k} ${typeof x === 'object' ? describeJson(x) : text(x)}`);
	return parts.length ? parts.join(', ') : NONE;
}
