/**
 * The element as it is being edited: every field as the person types it (text, so "0,035" and
 * half-typed numbers survive), and the same fields as the API takes them.
 */
import type { SurfaceConditions } from '$lib/physics/surface-films';
import { heatFlowForInclination, type ElementResult, type HeatFlow, type RoofSpace } from '$lib/physics';
import type { StoredBuildUp, StoredInternal } from '$lib/dwellings/element-input';
import {
	DEFAULT_HEAT_FLOW,
	ELEMENT_KIND_LABELS,
	GIVEN_U_KINDS,
	type ElementKind
} from '$lib/dwellings/kinds';
import {
	blankRow,
	buildUpFromRows,
	groundText,
	INCLINATION_KINDS,
	parseNumber,
	rowFromLayer,
	unheatedText,
	withUnheatedSpace,
	type EditRow,
	type GroundText,
	type UnheatedText
} from '$lib/dwellings/editor';

export type HumidityMode = 'class' | 'rh';

export type ClimateOption = {
	id: string;
	name: string;
	illustrative: boolean;
	months: { month: number; temperature: number; relativeHumidity: number }[];
};

/** An element as the page loads it. */
export type SavedElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: HeatFlow;
	buildUp: StoredBuildUp | null;
	givenU: number | null;
	givenUSource: string | null;
	/** a window's or door's ISO 10077-1 parts, when its U was worked out from them */
	windowParts?: Record<string, unknown> | null;
	climateId: string | null;
	internal: StoredInternal | null;
	lastResult: ElementResult | null;
	version: number;
};

/** The element's fields as the API takes them (numbers that do not parse stay as text for the schema to name). */
export type ElementFieldValues = {
	name: string;
	kind: ElementKind;
	area: number | string | undefined;
	heatFlow: HeatFlow;
	climateId: string | null;
	internal: Record<string, unknown>;
	buildUp: StoredBuildUp | null;
	givenU: number | string | undefined | null;
	givenUSource: string | null;
	windowParts: Record<string, unknown> | null;
};

/** Surface conditions other than the conventional ones (ISO 6946, Annex C), as typed ('' not given). */
export type SurfaceText = { internalEmissivity: string; externalEmissivity: string; windSpeed: string };

/** The values of a library material that a layer takes over from it. */
export type MaterialValues = {
	revisionId: string;
	lambda?: number | null;
	resistance?: number | null;
	muDry?: number | null;
	sd?: number | null;
};

/** Everything the person edits in the draft, as plain data (what undo and redo restore). */
export type DraftState = {
	name: string;
	kind: ElementKind;
	area: string;
	heatFlow: HeatFlow;
	climateId: string;
	internalTemp: string;
	humidityMode: HumidityMode;
	humidityClass: string;
	rh: string;
	givenU: string;
	givenUSource: string;
	rsi: string;
	rse: string;
	surface: SurfaceText;
	windowParts: Record<string, unknown> | null;
	unheated: UnheatedText;
	rows: EditRow[];
	ground: GroundText;
	roofSpace: RoofSpace | '';
	inclination: string;
};

export class ElementDraft {
	name: string = $state('');
	kind: ElementKind = $state('external-wall');
	area: string = $state('');
	heatFlow: HeatFlow = $state('horizontal');
	climateId: string = $state('');
	internalTemp: string = $state('');
	humidityMode: HumidityMode = $state('class');
	humidityClass: string = $state('');
	rh: string = $state('');
	givenU: string = $state('');
	givenUSource: string = $state('');
	rsi: string = $state('');
	rse: string = $state('');
	surface: SurfaceText = $state({ internalEmissivity: '', externalEmissivity: '', windSpeed: '' });
	/** the parts a window's or door's U was worked out from (ISO 10077-1), kept with it; null for a declared U */
	windowParts: Record<string, unknown> | null = $state(null);
	/** the unheated space beside a wall, roof or exposed floor (ISO 6946, 6.10.3), as typed */
	unheated: UnheatedText = $state(unheatedText(undefined));
	rows: EditRow[] = $state([]);
	ground: GroundText = $state(groundText(undefined));
	roofSpace: RoofSpace | '' = $state('');
	/** a roof's inclination from the horizontal, degrees, as typed ('' not given) */
	inclination: string = $state('');

	/** windows and doors: a given U-value instead of a build-up */
	readonly given = $derived(GIVEN_U_KINDS.includes(this.kind));

	/** roofs whose own plane is inclined take an inclination */
	readonly inclinable = $derived(INCLINATION_KINDS.includes(this.kind));

	/**
	 * The heat flow a valid inclination gives (ISO 6946:2017, 6.8, note to Table 7: horizontal at 60° or
	 * more from the horizontal, else upward for a roof), which then replaces the chosen one; null without.
	 */
	readonly inclinationHeatFlow: HeatFlow | null = $derived.by(() => {
		if (!this.inclinable) return null;
		const v = parseNumber(this.inclination);
		return typeof v === 'number' && v >= 0 && v <= 90 ? heatFlowForInclination(v, 'upward') : null;
	});

	readonly fields: ElementFieldValues = $derived.by(() => {
		const internal: Record<string, unknown> = { temperature: parseNumber(this.internalTemp) };
		if (this.humidityMode === 'class') internal.humidityClass = Number(this.humidityClass);
		else internal.relativeHumidity = parseNumber(this.rh);
		// the unheated space beside it goes into the build-up for the kinds that may have one
		return withUnheatedSpace(
			{
				name: this.name,
				kind: this.kind,
				area: parseNumber(this.area),
				heatFlow: this.inclinationHeatFlow ?? this.heatFlow,
				climateId: this.climateId || null,
				internal,
				buildUp: this.given
					? null
					: withSurfaceConditions(
							buildUpFromRows(this.rows, this.rsi, this.rse, {
								ground: this.kind === 'ground-floor' ? this.ground : null,
								roofSpace: this.kind === 'pitched-roof-ceiling' ? this.roofSpace : null,
								inclination: this.inclinable ? this.inclination : null
							}),
							this.surface,
							this.kind !== 'ground-floor'
						),
				givenU: this.given ? parseNumber(this.givenU) : null,
				givenUSource: this.given ? this.givenUSource : null,
				windowParts: this.given ? this.windowParts : null
			},
			this.unheated
		);
	});

	/** From the saved element, or for a new one of the given kind. */
	constructor(start: SavedElement | null, initialKind: ElementKind) {
		this.name = start?.name ?? ELEMENT_KIND_LABELS[initialKind];
		this.kind = start?.kind ?? initialKind;
		this.area = start ? String(start.area) : '';
		this.heatFlow = start?.heatFlow ?? DEFAULT_HEAT_FLOW[initialKind];
		this.climateId = start?.climateId ?? '';
		this.internalTemp = String(start?.internal?.temperature ?? 20);
		this.humidityMode = start?.internal?.relativeHumidity !== undefined ? 'rh' : 'class';
		this.humidityClass = String(start?.internal?.humidityClass ?? 3);
		this.rh = String(start?.internal?.relativeHumidity ?? 50);
		this.givenU = start?.givenU != null ? String(start.givenU) : '';
		this.givenUSource = start?.givenUSource ?? '';
		this.rsi = start?.buildUp?.rsi !== undefined ? String(start.buildUp.rsi) : '';
		this.rse = start?.buildUp?.rse !== undefined ? String(start.buildUp.rse) : '';
		this.surface = surfaceText(start?.buildUp?.surfaceConditions);
		this.windowParts = start?.windowParts ?? null;
		this.unheated = unheatedText(start?.buildUp?.unheatedSpace);
		this.rows = start?.buildUp?.layers?.length ? start.buildUp.layers.map(rowFromLayer) : [blankRow()];
		this.ground = groundText(start?.buildUp?.ground);
		this.roofSpace = start?.buildUp?.roofSpace ?? '';
		this.inclination =
			start?.buildUp?.inclinationDeg !== undefined ? String(start.buildUp.inclinationDeg) : '';
	}

	/** The edited state as plain data (read inside an effect, it tracks every field). */
	snapshot(): DraftState {
		return $state.snapshot({
			name: this.name,
			kind: this.kind,
			area: this.area,
			heatFlow: this.heatFlow,
			climateId: this.climateId,
			internalTemp: this.internalTemp,
			humidityMode: this.humidityMode,
			humidityClass: this.humidityClass,
			rh: this.rh,
			givenU: this.givenU,
			givenUSource: this.givenUSource,
			rsi: this.rsi,
			rse: this.rse,
			surface: this.surface,
			windowParts: this.windowParts,
			unheated: this.unheated,
			rows: this.rows,
			ground: this.ground,
			roofSpace: this.roofSpace,
			inclination: this.inclination
		}) as DraftState;
	}

	/** Back to a state `snapshot()` gave (undo, redo); rows keep their keys, so the table keeps its rows. */
	restore(s: DraftState) {
		const c = structuredClone(s);
		this.name = c.name;
		this.kind = c.kind;
		this.area = c.area;
		this.heatFlow = c.heatFlow;
		this.climateId = c.climateId;
		this.internalTemp = c.internalTemp;
		this.humidityMode = c.humidityMode;
		this.humidityClass = c.humidityClass;
		this.rh = c.rh;
		this.givenU = c.givenU;
		this.givenUSource = c.givenUSource;
		this.rsi = c.rsi;
		this.rse = c.rse;
		this.surface = c.surface;
		this.windowParts = c.windowParts;
		this.unheated = c.unheated;
		this.rows = c.rows;
		this.ground = c.ground;
		this.roofSpace = c.roofSpace;
		this.inclination = c.inclination;
	}

	/** A new kind; the name and heat flow follow it while they are still the old kind's defaults. */
	changeKind(k: ElementKind) {
		const autoName = this.name === ELEMENT_KIND_LABELS[this.kind];
		const autoFlow = this.heatFlow === DEFAULT_HEAT_FLOW[this.kind];
		this.kind = k;
		if (autoName) this.name = ELEMENT_KIND_LABELS[k];
		if (autoFlow) this.heatFlow = DEFAULT_HEAT_FLOW[k];
	}

	/** What was typed in a field whose error stays hidden while it is empty; undefined for other fields. */
	typedText(path: string): string | undefined {
		switch (path) {
			case 'name':
				return this.name;
			case 'area':
				return this.area;
			case 'ground.areaM2':
				return this.ground.area;
			case 'ground.groundLambda':
				return this.ground.lambda;
			case 'ground.wallThicknessM':
				return this.ground.wall;
			case 'inclinationDeg':
				return this.inclination;
			default:
				return undefined;
		}
	}

	useThickness(layerIndex: number, mm: number) {
		this.rows[layerIndex].thickness = String(mm);
	}

	/** The layers, surface resistances and roof space of a template (the rest of the element stays). */
	useBuildUp(b: StoredBuildUp) {
		this.rows = b.layers.map((l) => rowFromLayer(l));
		if (b.rsi !== undefined) this.rsi = String(b.rsi);
		if (b.rse !== undefined) this.rse = String(b.rse);
		if (b.roofSpace !== undefined) this.roofSpace = b.roofSpace;
		if (b.inclinationDeg !== undefined) this.inclination = String(b.inclinationDeg);
		if (b.unheatedSpace) this.unheated = unheatedText(b.unheatedSpace);
	}

	/** A layer takes a newer library revision's values; false when the layer is no longer there. */
	applyMaterial(layerIndex: number, m: MaterialValues): boolean {
		const r = this.rows[layerIndex];
		if (!r) return false;
		r.materialRevisionId = m.revisionId;
		if (m.lambda != null) {
			r.mode = 'lambda';
			r.lambda = String(m.lambda);
		} else if (m.resistance != null) {
			r.mode = 'resistance';
			r.resistance = String(m.resistance);
		}
		if (m.muDry != null) {
			r.vapour = 'mu';
			r.mu = String(m.muDry);
		} else if (m.sd != null) {
			r.vapour = 'sd';
			r.sd = String(m.sd);
		}
		return true;
	}
}

/** Stored surface conditions as typed. */
function surfaceText(c: SurfaceConditions | undefined): SurfaceText {
	const t = (v: number | undefined) => (v === undefined ? '' : String(v));
	return {
		internalEmissivity: t(c?.internalEmissivity),
		externalEmissivity: t(c?.externalEmissivity),
		windSpeed: t(c?.windSpeed)
	};
}

/**
 * The build-up with the surface conditions typed (text that is no number goes on for the schema to
 * name); none when nothing is typed, and none for a floor on the ground, whose surface resistances
 * ISO 13370 sets.
 */
function withSurfaceConditions(b: StoredBuildUp, t: SurfaceText, offered: boolean): StoredBuildUp {
	if (!offered) return b;
	const c: Record<string, unknown> = {};
	if (t.internalEmissivity.trim()) c.internalEmissivity = parseNumber(t.internalEmissivity);
	if (t.externalEmissivity.trim()) c.externalEmissivity = parseNumber(t.externalEmissivity);
	if (t.windSpeed.trim()) c.windSpeed = parseNumber(t.windSpeed);
	return Object.keys(c).length ? { ...b, surfaceConditions: c as SurfaceConditions } : b;
}
