/**
 * A junction's model in words, for the report and anyone else who must say what was calculated: the
 * type and the elements it was built from (their layers, inside to outside), the builder's details (a
 * gap in the insulation, an insert, a slab, a window panel, ground levels), the materials of the model
 * and the environments its boundaries face. Pure: it reads the stored choices and the model only.
 */
import { ELEMENT_KIND_LABELS, type ElementKind } from '$lib/dwellings/kinds';
import type { StoredBuildUp } from '$lib/dwellings/element-input';
import type { JunctionInput } from '$lib/physics/junction-schema';
import { fx, trim } from '$lib/format';
import { JUNCTION_TYPE_LABELS, type JunctionType } from './kinds';
import type { JunctionDetails } from './schema';
import { FLOOR_SLAB_DEFAULT, GROUND_DEFAULT, WINDOW_PANEL_MM_DEFAULT, WINDOW_U_DEFAULT } from './builder';

/** An element as the description names it. */
export interface DescribedElement {
	id: string;
	name: string;
	kind: string;
	buildUp: StoredBuildUp | null;
	givenU?: number | null;
}

/** What is described: the junction's type, its stored choices and the model that was computed. */
export interface DescribedJunction {
	type: JunctionType;
	details: JunctionDetails | null;
	model: JunctionInput | null;
}

/** One material of a model: its name and λ, in the order the regions first use it. */
export interface ModelMaterial {
	name: string;
	lambda: number;
	/** how many rectangles of the model are of it */
	regions: number;
}

const kindLabel = (k: string) => ELEMENT_KIND_LABELS[k as ElementKind] ?? k;
const quoted = (s: string) => `“${s}”`;

/** Names in a sentence: "A", "A and B", "A, B and C". */
function sentenceList(list: string[]): string {
	return list.length > 1 ? `${list.slice(0, -1).join(', ')} and ${list[list.length - 1]}` : (list[0] ?? '');
}

/** "“Cavity wall” (external wall, 313 mm: 13 mm Plaster, 100 mm Block …)"; `brief` leaves the layers out. */
export function elementInWords(e: DescribedElement, brief = false): string {
	const layers = e.buildUp?.layers ?? [];
	if (!layers.length)
		return e.givenU != null
			? `${quoted(e.name)} (${kindLabel(e.kind).toLowerCase()}, given U ${trim(e.givenU, 3)} W/(m²·K))`
			: `${quoted(e.name)} (${kindLabel(e.kind).toLowerCase()})`;
	const total = layers.reduce((s, l) => s + l.thicknessMm, 0);
	if (brief)
		return `${quoted(e.name)} (${kindLabel(e.kind).toLowerCase()}, ${layers.length} layer${layers.length === 1 ? '' : 's'}, ${trim(total, 1)} mm)`;
	const list = layers.map((l) => `${trim(l.thicknessMm, 1)} mm ${l.name || 'unnamed layer'}`).join(', ');
	return `${quoted(e.name)} (${kindLabel(e.kind).toLowerCase()}, ${trim(total, 1)} mm: ${list})`;
}

/** The distinct materials (name and λ) of a model, in the order of its regions. */
export function modelMaterials(model: JunctionInput): ModelMaterial[] {
	const out = new Map<string, ModelMaterial>();
	model.regions.forEach((r, i) => {
		const name = r.name?.trim() || `Rectangle ${i + 1}`;
		const key = `${name}\u0000${r.lambda}`;
		const m = out.get(key);
		if (m) m.regions++;
		else out.set(key, { name, lambda: r.lambda, regions: 1 });
	});
	return [...out.values()];
}

/** The environments a model's boundaries face, warmest first: "inside (20 °C, Rs 0.13 m²·K/W)". */
export function environmentsInWords(model: JunctionInput): string {
	const used = new Set(model.boundaries.map((b) => b.environment));
	const list = Object.entries(model.environments)
		.filter(([name]) => used.has(name))
		.sort((a, b) => b[1].temperature - a[1].temperature || a[0].localeCompare(b[0]))
		.map(
			([name, e]) =>
				`${name} (${fx(e.temperature, 1)} °C, ${e.rs === 0 ? 'surface temperature fixed' : `Rs ${trim(e.rs, 3)} m²·K/W`})`
		);
	return sentenceList(list);
}

/** The builder's details that change the model, one phrase each. */
function detailPhrases(type: JunctionType, d: JunctionDetails, first: DescribedElement | null): string[] {
	const out: string[] = [];
	const layers = first?.buildUp?.layers ?? [];
	if (d.insulationLayer !== undefined) {
		const l = layers[d.insulationLayer];
		out.push(
			`its main insulation taken as layer ${d.insulationLayer + 1}${l ? ` ${quoted(l.name)}` : ''} of the first element`
		);
	}
	if (d.gap)
		out.push(
			`a ${trim(d.gap.widthMm, 1)} mm gap in that insulation at the junction, filled with a material of λ ${trim(d.gap.lambda, 4)} W/(m·K)`
		);
	if (d.insert)
		out.push(
			`${quoted(d.insert.name)} of λ ${trim(d.insert.lambda, 4)} W/(m·K), ${trim(d.insert.lengthMm, 1)} mm long from ${trim(d.insert.alongFromMm, 1)} mm along the element and ${trim(d.insert.depthFromMm, 1)}–${trim(d.insert.depthToMm, 1)} mm from its inside face`
		);
	if (type === 'intermediate-floor') {
		const s = d.floorSlab ?? FLOOR_SLAB_DEFAULT;
		out.push(
			`a floor slab ${trim(s.thicknessMm, 1)} mm thick of λ ${trim(s.lambda, 4)} W/(m·K)${d.floorSlab ? '' : ' (the builder’s default)'}`
		);
	}
	if (type === 'window-head' || type === 'window-jamb' || type === 'window-sill') {
		const t = d.window?.thicknessMm ?? WINDOW_PANEL_MM_DEFAULT;
		out.push(
			`the window as a panel ${trim(t, 1)} mm thick${d.window?.positionMm !== undefined ? ` with its inside face ${trim(d.window.positionMm, 1)} mm into the wall` : ' in line with the insulation'}${d.elements.b ? '' : ` of U ${trim(WINDOW_U_DEFAULT, 2)} W/(m²·K) (no window element picked)`}`
		);
	}
	if (type === 'ground-floor') {
		const g = { ...GROUND_DEFAULT, ...d.ground };
		out.push(
			`the floor surface ${trim(g.floorAboveGroundMm, 1)} mm above the ground outside and the wall running ${trim(g.wallBelowFloorMm, 1)} mm below the floor${d.ground ? '' : ' (the builder’s defaults)'}`
		);
	}
	if ((type === 'eaves' || type === 'flat-roof') && d.overWallMm !== undefined)
		out.push(`the ceiling or roof layers running ${trim(d.overWallMm, 1)} mm over the wall head`);
	if (d.internal)
		out.push(
			`inside conditions of ${fx(d.internal.temperature, 1)} °C${d.internal.humidityClass !== undefined ? `, humidity class ${d.internal.humidityClass}` : d.internal.relativeHumidity !== undefined ? `, ${trim(d.internal.relativeHumidity, 1)} % relative humidity` : ''} for the surface check`
		);
	return out;
}

/**
 * The model in words, a few sentences: what it was built from (or that it was entered as rectangles),
 * the details, its materials and the environments of its boundaries; every other edge is adiabatic.
 */
export function describeJunctionModel(j: DescribedJunction, elements: readonly DescribedElement[]): string[] {
	const out: string[] = [];
	const d = j.details;
	const byId = (id: string | undefined) => (id ? (elements.find((e) => e.id === id) ?? null) : null);
	if (d?.mode === 'builder') {
		const a = byId(d.elements.a);
		const b = byId(d.elements.b);
		const label = JUNCTION_TYPE_LABELS[j.type];
		// the layers are named with their λ among the materials below
		const brief = j.model !== null;
		const aText = a ? elementInWords(a, brief) : 'an element no longer in the dwelling';
		const corner = j.type === 'external-corner' || j.type === 'internal-corner';
		const bText = b && b !== a ? elementInWords(b, brief) : corner ? 'the same wall again' : null;
		out.push(
			`${label}, built from the dwelling’s own elements: ${aText}${bText ? ` meeting ${bText}` : ''}, each with its layers, inside to outside, as rectangles of material.`
		);
		const phrases = detailPhrases(j.type, d, a);
		if (phrases.length) out.push(`Details: ${sentenceList(phrases)}.`);
	} else if (j.model) {
		out.push(
			`A free-form model of ${j.model.regions.length} rectangle${j.model.regions.length === 1 ? '' : 's'} of material, entered as such (a later rectangle overrides earlier ones where they overlap).`
		);
	}
	if (j.model) {
		const materials = modelMaterials(j.model).map((m) => `${m.name} λ ${trim(m.lambda, 4)}`);
		out.push(`Materials, W/(m·K): ${sentenceList(materials)}.`);
		out.push(
			`Its boundaries face ${environmentsInWords(j.model)}; every other edge of the material is adiabatic, a cut-off or symmetry plane.`
		);
	}
	return out;
}
