/**
 * The heat capacity of a dwelling's elements (`$lib/dwellings/heat-capacity`), from each element's stored
 * build-up with the surface and layer resistances its U-value takes, so that the dynamic figures
 * describe the same element as its U-value. Read on its own, after the page, as it needs the
 * build-ups that the dwelling's overview leaves out.
 */
import { db } from '$lib/server/db';
import { analyseElement, type ElementResult, type HeatFlow } from '$lib/physics';
import { elementDynamics } from '$lib/dwellings/dynamic';
import { toElementInput, type StoredBuildUp } from '$lib/dwellings/element-input';
import type { ElementKind } from '$lib/dwellings/kinds';
import { dwellingHeatCapacity, type DwellingHeatCapacity } from '$lib/dwellings/heat-capacity';

export async function readDwellingHeatCapacity(
	organisationId: string,
	dwellingId: string,
	floorArea: number | null
): Promise<DwellingHeatCapacity> {
	// Only the build-ups: the surface and layer resistances are worked out again without a climate (the
	// U-value part of the engine, a fraction of a millisecond), which is far cheaper than reading each
	// element's stored result, with its monthly moisture arrays, from the database.
	const rows = await db('elements')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'position' }, { column: 'created_at' }])
		.select('id', 'name', 'kind', 'area', 'heat_flow', 'build_up');
	return dwellingHeatCapacity(
		rows.map((r) => {
			const buildUp = r.build_up as StoredBuildUp | null;
			const base = {
				id: r.id as string,
				name: r.name as string,
				kind: r.kind as ElementKind,
				area: Number(r.area)
			};
			if (!buildUp) return { ...base, dynamics: null };
			let result: ElementResult;
			try {
				result = analyseElement(
					toElementInput({ heatFlow: r.heat_flow as HeatFlow, buildUp, internal: null, area: base.area })
				);
			} catch (e) {
				return { ...base, dynamics: { ok: false as const, reason: (e as Error).message } };
			}
			return { ...base, dynamics: elementDynamics(buildUp, result) };
		}),
		floorArea
	);
}
