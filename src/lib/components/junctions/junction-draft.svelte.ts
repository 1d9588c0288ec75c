/**
 * The junction editor's fields as the person edits them, and what they become: the run request the
 * worker computes (the same one the server runs on save) and the body of the save.
 */
import type { JunctionInput } from '$lib/physics/junction-schema';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import type { DimensionSystem, JunctionType, PsiSource } from '$lib/junctions/kinds';
import { junctionDetailsSchema, type JunctionDetails } from '$lib/junctions/schema';
import type { JunctionFields } from '$lib/junctions/record';
import { fieldIssues, type FieldIssue } from '$lib/validation';
import type { ElementLike, RunRequest } from '$lib/junctions/run';
import { DEFAULT_JUNCTION_INTERNAL } from '$lib/junctions/surface';
import { FLOOR_SLAB_DEFAULT, GROUND_DEFAULT, WINDOW_PANEL_MM_DEFAULT } from '$lib/junctions/builder';

export type EnvRow = { name: string; temperature: number | null; rs: number | null };

/** A stored junction as the editor starts from it. */
export type SavedJunction = JunctionFields & {
	model: JunctionInput | null;
	version: number;
};

const num = (v: number | null | undefined): number | undefined =>
	v === null || v === undefined || !Number.isFinite(v) ? undefined : v;

/** A small free-form model to start from: one wall, 300 mm, with flanks (invented, for editing). */
export const FREE_FORM_START: JunctionInput = {
	regions: [{ name: 'Wall', x0: 0, x1: 300, y0: 0, y1: 2000, lambda: 0.5 }],
	boundaries: [
		{ from: [0, 0], to: [0, 2000], environment: 'outside' },
		{ from: [300, 0], to: [300, 2000], environment: 'inside' }
	],
	environments: { inside: { temperature: 20, rs: 0.13 }, outside: { temperature: 0, rs: 0.04 } },
	flanks: [{ name: 'Wall', uValue: 1 / (0.13 + 0.6 + 0.04), lengthMm: 2000 }]
};

export class JunctionDraft {
	name = $state('');
	type = $state<JunctionType>('external-corner');
	lengthM = $state<number | null>(null);
	source = $state<PsiSource>('calculated');
	dimensionSystem = $state<DimensionSystem>('external');
	psiEntered = $state<number | null>(null);
	psiSource = $state('');
	mode = $state<'builder' | 'free-form'>('builder');
	a = $state('');
	b = $state('');
	insulationLayer = $state<string>('');
	gapOn = $state(false);
	gapWidthMm = $state<number | null>(50);
	gapLambda = $state<number | null>(0.5);
	insertOn = $state(false);
	insertName = $state('Lintel');
	insertLambda = $state<number | null>(50);
	insertAlongFromMm = $state<number | null>(0);
	insertLengthMm = $state<number | null>(150);
	insertDepthFromMm = $state<number | null>(0);
	insertDepthToMm = $state<number | null>(100);
	slabThicknessMm = $state<number | null>(FLOOR_SLAB_DEFAULT.thicknessMm);
	slabLambda = $state<number | null>(FLOOR_SLAB_DEFAULT.lambda);
	windowThicknessMm = $state<number | null>(WINDOW_PANEL_MM_DEFAULT);
	windowPositionMm = $state<number | null>(null);
	floorAboveGroundMm = $state<number | null>(GROUND_DEFAULT.floorAboveGroundMm);
	wallBelowFloorMm = $state<number | null>(GROUND_DEFAULT.wallBelowFloorMm);
	overWallMm = $state<number | null>(null);
	insideTemperature = $state<number | null>(DEFAULT_JUNCTION_INTERNAL.temperature);
	humidityClass = $state<string>(String(DEFAULT_JUNCTION_INTERNAL.humidityClass));
	regions = $state<JunctionInput['regions']>([]);
	boundaries = $state<JunctionInput['boundaries']>([]);
	environments = $state<EnvRow[]>([]);
	flanks = $state<NonNullable<JunctionInput['flanks']>>([]);

	constructor(saved: SavedJunction | null, type: JunctionType, elements: ElementLike[]) {
		if (saved) this.#load(saved);
		else {
			this.type = type;
			this.mode = type === 'other' ? 'free-form' : 'builder';
			const wall = elements.find((e) => e.kind === 'external-wall');
			if (wall) this.a = wall.id;
			if (type === 'other') this.setModel(FREE_FORM_START);
		}
	}

	#load(j: SavedJunction) {
		this.name = j.name;
		this.type = j.type;
		this.lengthM = j.lengthM;
		this.source = j.source;
		this.dimensionSystem = j.dimensionSystem;
		this.psiEntered = j.psiEntered;
		this.psiSource = j.psiSource ?? '';
		const d = j.details;
		if (j.model) this.setModel(j.model);
		if (!d) return;
		this.mode = d.mode;
		this.a = d.elements?.a ?? '';
		this.b = d.elements?.b ?? '';
		this.insulationLayer = d.insulationLayer === undefined ? '' : String(d.insulationLayer);
		if (d.gap) Object.assign(this, { gapOn: true, gapWidthMm: d.gap.widthMm, gapLambda: d.gap.lambda });
		if (d.insert)
			Object.assign(this, {
				insertOn: true,
				insertName: d.insert.name,
				insertLambda: d.insert.lambda,
				insertAlongFromMm: d.insert.alongFromMm,
				insertLengthMm: d.insert.lengthMm,
				insertDepthFromMm: d.insert.depthFromMm,
				insertDepthToMm: d.insert.depthToMm
			});
		if (d.floorSlab)
			Object.assign(this, { slabThicknessMm: d.floorSlab.thicknessMm, slabLambda: d.floorSlab.lambda });
		if (d.window)
			Object.assign(this, {
				windowThicknessMm: d.window.thicknessMm,
				windowPositionMm: d.window.positionMm ?? null
			});
		if (d.ground) Object.assign(this, d.ground);
		if (d.overWallMm !== undefined) this.overWallMm = d.overWallMm;
		if (d.internal) {
			this.insideTemperature = d.internal.temperature;
			this.humidityClass = d.internal.humidityClass ? String(d.internal.humidityClass) : '';
		}
	}

	/** The model's mode as saved: a type the builder does not know is always free-form. */
	get effectiveMode(): 'builder' | 'free-form' {
		return this.type === 'other' ? 'free-form' : this.mode;
	}

	/** Free-form tables to start from when there are none yet. */
	ensureModel() {
		if (!this.regions.length) this.setModel(FREE_FORM_START);
	}

	/** Take a model into the free-form tables (a built one, to edit further by hand). */
	setModel(m: JunctionInput) {
		this.regions = m.regions.map((r) => ({ ...r }));
		this.boundaries = m.boundaries.map((b) => ({ ...b, from: [...b.from], to: [...b.to] }));
		this.environments = Object.entries(m.environments).map(([name, e]) => ({ name, ...e }));
		this.flanks = (m.flanks ?? []).map((f) => ({ ...f }));
	}

	/** The free-form tables as the engine's input (the engine names whatever is missing or wrong). */
	model(): JunctionInput {
		return {
			regions: this.regions,
			boundaries: this.boundaries,
			environments: Object.fromEntries(
				this.environments.map((e) => [e.name, { temperature: e.temperature as number, rs: e.rs as number }])
			),
			flanks: this.flanks
		};
	}

	details(): JunctionDetails {
		const d: JunctionDetails = { mode: this.effectiveMode, elements: {} };
		if (this.effectiveMode === 'free-form') return { ...d, internal: this.internal() };
		if (this.a) d.elements.a = this.a;
		if (this.b) d.elements.b = this.b;
		if (this.insulationLayer !== '') d.insulationLayer = Number(this.insulationLayer);
		if (this.gapOn) d.gap = { widthMm: this.gapWidthMm as number, lambda: this.gapLambda as number };
		if (this.insertOn)
			d.insert = {
				name: this.insertName,
				lambda: this.insertLambda as number,
				alongFromMm: this.insertAlongFromMm ?? 0,
				lengthMm: this.insertLengthMm as number,
				depthFromMm: this.insertDepthFromMm as number,
				depthToMm: this.insertDepthToMm as number
			};
		if (this.type === 'intermediate-floor')
			d.floorSlab = { thicknessMm: this.slabThicknessMm as number, lambda: this.slabLambda as number };
		if (this.type.startsWith('window-'))
			d.window = {
				thicknessMm: this.windowThicknessMm as number,
				...(num(this.windowPositionMm) === undefined ? {} : { positionMm: this.windowPositionMm as number })
			};
		if (this.type === 'ground-floor')
			d.ground = {
				floorAboveGroundMm: this.floorAboveGroundMm as number,
				wallBelowFloorMm: this.wallBelowFloorMm as number
			};
		if ((this.type === 'eaves' || this.type === 'flat-roof') && num(this.overWallMm) !== undefined)
			d.overWallMm = this.overWallMm as number;
		d.internal = this.internal();
		return d;
	}

	internal(): JunctionDetails['internal'] {
		return {
			temperature: this.insideTemperature as number,
			...(this.humidityClass ? { humidityClass: Number(this.humidityClass) as 1 | 2 | 3 | 4 | 5 } : {})
		};
	}

	/** The request the worker computes, the issues of the choices, or null when ψ is entered. */
	runRequest(
		elements: ElementLike[],
		months: ClimateMonthValues[] | null
	): RunRequest | { issues: FieldIssue[] } | null {
		if (this.source === 'entered') return null;
		const details = junctionDetailsSchema.safeParse(this.details());
		if (!details.success)
			return { issues: fieldIssues(details.error).map((i) => ({ ...i, path: `details.${i.path}` })) };
		return {
			type: this.type,
			dimensionSystem: this.dimensionSystem,
			details: details.data,
			...(this.effectiveMode === 'free-form' ? { model: this.model() } : {}),
			elements,
			months,
			field: { maxLines: 140 }
		};
	}

	/** The body of a save (POST, or PUT with the version). */
	body(): Record<string, unknown> {
		const entered = this.source === 'entered';
		return {
			name: this.name,
			type: this.type,
			lengthM: this.lengthM,
			source: this.source,
			dimensionSystem: this.dimensionSystem,
			...(entered
				? { psiEntered: this.psiEntered, psiSource: this.psiSource }
				: { details: this.details(), ...(this.effectiveMode === 'free-form' ? { model: this.model() } : {}) })
		};
	}
}
