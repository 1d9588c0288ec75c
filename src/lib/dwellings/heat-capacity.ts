/**
 * The heat capacity of a dwelling's elements, as summer-overheating checks and the monthly methods of
 * national calculations take it: each element's internal areal heat capacity κ1 (ISO 13786:2017, 24-hour
 * period, from ./dynamic) times its area, summed to the internal heat capacity Cm = Σ κ1·A (ISO 13790:2008,
 * 12.3.1.1, from memory), the effective mass area Am = Cm² / Σ(A·κ1²) (ISO 13790:2008, 12.3.1.2, from
 * memory), the heat capacity per floor area Cm / Af where the floor area is given, and the area-weighted
 * decrement factor and periodic transmittance of the opaque elements. Pure; the dwelling page calls it.
 *
 * Only the elements entered count: internal walls, intermediate floors and furnishings are not elements
 * here, so Cm is the envelope's share and the figure per floor area is a lower bound of the dwelling's.
 */
import type { ElementKind } from './kinds';
import type { ElementDynamics } from './dynamic';

/** What the sum reads of an element. */
export type HeatCapacityElement = {
	id: string;
	name: string;
	kind: ElementKind;
	/** m² */
	area: number;
	/** the element's ISO 13786 figures, or why there are none; null when it has no build-up (a given U) */
	dynamics: ElementDynamics | null;
};

export type CountedElement = {
	id: string;
	name: string;
	area: number;
	/** kJ/(m²·K) */
	kappa1: number;
	/** κ1·A, kJ/K */
	kappa1Area: number;
	decrementFactor: number | null;
	/** |Y12|, W/(m²·K) */
	y12: number | null;
	/** time lag of the internal response, h */
	timeLagH: number | null;
};

export type DwellingHeatCapacity = {
	counted: CountedElement[];
	/** windows and doors: their heat capacity is taken as zero (common practice, no source) */
	glazed: { id: string; name: string; area: number }[];
	/** elements whose κ1 is not known, and why */
	missing: { id: string; name: string; reason: string }[];
	/** Cm = Σ κ1·A over the counted elements, kJ/K; null when none is counted */
	cm: number | null;
	/** Am = Cm² / Σ(A·κ1²), m²; null when Cm is zero or none is counted */
	am: number | null;
	/** the total floor area Af, m², as given on the dwelling */
	floorArea: number | null;
	/** Cm / Af, kJ/(m²·K); null without a floor area */
	cmPerFloorArea: number | null;
	/** Σ |Y12|·A over the counted elements, W/K */
	periodicTransmittanceArea: number | null;
	/** Σ f·A / Σ A over the counted elements */
	meanDecrementFactor: number | null;
	/** Σ Δt·A / Σ A over the counted elements, h */
	meanTimeLagH: number | null;
	/** every opaque element is counted */
	complete: boolean;
};

const GLAZED: readonly ElementKind[] = ['window', 'door'];

/** The heat capacity of the elements as entered (see the module's note for what it leaves out). */
export function dwellingHeatCapacity(
	elements: readonly HeatCapacityElement[],
	floorArea: number | null
): DwellingHeatCapacity {
	const counted: CountedElement[] = [];
	const glazed: DwellingHeatCapacity['glazed'] = [];
	const missing: DwellingHeatCapacity['missing'] = [];
	for (const e of elements) {
		if (GLAZED.includes(e.kind)) {
			glazed.push({ id: e.id, name: e.name, area: e.area });
			continue;
		}
		if (!e.dynamics) {
			missing.push({ id: e.id, name: e.name, reason: 'no build-up: its U-value is given' });
			continue;
		}
		if (!e.dynamics.ok) {
			missing.push({ id: e.id, name: e.name, reason: e.dynamics.reason });
			continue;
		}
		const d = e.dynamics.value;
		counted.push({
			id: e.id,
			name: e.name,
			area: e.area,
			kappa1: d.kappa1,
			kappa1Area: d.kappa1 * e.area,
			decrementFactor: d.decrementFactor,
			y12: d.y12.modulus,
			timeLagH: d.y12.timeLagH
		});
	}
	const sum = (f: (c: CountedElement) => number) => counted.reduce((s, c) => s + f(c), 0);
	const area = sum((c) => c.area);
	const cm = counted.length ? sum((c) => c.kappa1Area) : null;
	const squares = sum((c) => c.area * c.kappa1 * c.kappa1);
	const weighted = (f: (c: CountedElement) => number | null) =>
		counted.length && area > 0 ? sum((c) => (f(c) ?? 0) * c.area) / area : null;
	return {
		counted,
		glazed,
		missing,
		cm,
		am: cm !== null && squares > 0 ? (cm * cm) / squares : null,
		floorArea,
		cmPerFloorArea: cm !== null && floorArea ? cm / floorArea : null,
		periodicTransmittanceArea: counted.length ? sum((c) => (c.y12 ?? 0) * c.area) : null,
		meanDecrementFactor: weighted((c) => c.decrementFactor),
		meanTimeLagH: weighted((c) => c.timeLagH),
		complete: missing.length === 0
	};
}
