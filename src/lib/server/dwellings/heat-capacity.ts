/**
 * The heat capacity of a dwelling's elements (`$lib/dwellings/heat-capacity`), from each element's stored
 * build-up and the parts of its stored result that the ISO 13786 matrices take (surface resistances, the
 * layers' resistances and which are disregarded, whether it lies on the ground), so that the dynamic
 * figures describe the same element as its U-value. Read on its own, after the page, as it needs the
 * build-ups that the dwelling's overview leaves out.
 */
import { db } from '$lib/server/db';
import type { ElementResult } from '$lib/physics';
import { elementDynamics } from '$lib/dwellings/dynamic';
import type { StoredBuildUp } from '$lib/dwellings/element-input';
import type { ElementKind } from '$lib/dwellings/kinds';
import { dwellingHeatCapacity, type DwellingHeatCapacity } from '$lib/dwellings/heat-capacity';

export async function readDwellingHeatCapacity(
	organisationId: string,
	dwellingId: string,
	floorArea: number | null
): Promise<DwellingHeatCapacity> {
	const rows = await db('elements')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'position' }, { column: 'created_at' }])
		.select(
			'id',
			'name',
			'kind',
			'area',
			'build_up',
			db.raw(`last_result->'rsi' AS rsi`),
			db.raw(`last_result->'rse' AS rse`),
			db.raw(`last_result->'layers' AS layers`),
			db.raw(`last_result->'ground' IS NOT NULL AND last_result->'ground' <> 'null'::jsonb AS on_ground`),
			db.raw(`last_result IS NOT NULL AS computed`)
		);
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
			if (!r.computed)
				return { ...base, dynamics: { ok: false as const, reason: 'not calculated yet: open and save it' } };
			// Only the parts of the result that elementDynamics reads.
			const result = {
				rsi: Number(r.rsi),
				rse: Number(r.rse),
				layers: (r.layers ?? []) as ElementResult['layers'],
				ground: r.on_ground ? ({} as ElementResult['ground']) : undefined
			} as unknown as ElementResult;
			return { ...base, dynamics: elementDynamics(buildUp, result) };
		}),
		floorArea
	);
}
