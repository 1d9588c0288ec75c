/**
 * Design and as-built side by side: each element of an as-built dwelling beside the design element it
 * was copied from (by the kept link, so a rename still pairs them), with its build-up, its U and what
 * changed; design elements with no as-built counterpart, and as-built elements added on site, too.
 * Nominal against installed thickness and a swapped product are the usual findings, so every layer
 * difference is listed.
 */
import { db } from '$lib/server/db';
import type { Change } from '$lib/dwellings/changes';
import type { ElementKind } from '$lib/dwellings/kinds';
import type { ElementResult } from '$lib/physics';
import { NotFoundError } from '$lib/server/errors';
import type { DwellingRow, ElementRow } from '$lib/server/tables';
import { compareElementRows } from './elements';

export type StageSide = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	u: number | null;
	layers: { name: string; thicknessMm: number; lambda: number | null }[];
};

export type StagePair = { design: StageSide | null; asBuilt: StageSide | null; changes: Change[] };

export type StageComparison = {
	design: { id: string; reference: string; address: string };
	asBuilt: { id: string; reference: string; address: string };
	pairs: StagePair[];
	/** how many pairs differ at all */
	changed: number;
};

function side(r: ElementRow): StageSide {
	const layers = (r.build_up?.layers ?? []).map((l) => ({
		name: l.name,
		thicknessMm: l.thicknessMm,
		lambda: l.lambda ?? null
	}));
	const u = (r.last_result as ElementResult | null)?.uValueRounded ?? r.given_u ?? null;
	return { id: r.id, name: r.name, kind: r.kind, area: r.area, u, layers };
}

const brief = (d: DwellingRow) => ({ id: d.id, reference: d.reference, address: d.address });

/** The comparison of an as-built dwelling with its design; null when it was not copied from one. */
export async function compareStages(
	organisationId: string,
	asBuiltId: string
): Promise<StageComparison | null> {
	const asBuilt = await db<DwellingRow>('dwellings')
		.where({ organisation_id: organisationId, id: asBuiltId })
		.first();
	if (!asBuilt) throw new NotFoundError('No such dwelling.');
	if (!asBuilt.design_id) return null;
	const design = await db<DwellingRow>('dwellings')
		.where({ organisation_id: organisationId, id: asBuilt.design_id })
		.first();
	if (!design) return null;
	const order = [{ column: 'position' }, { column: 'created_at' }];
	const [built, designed] = await Promise.all([
		db<ElementRow>('elements')
			.where({ organisation_id: organisationId, dwelling_id: asBuilt.id })
			.orderBy(order),
		db<ElementRow>('elements')
			.where({ organisation_id: organisationId, dwelling_id: design.id })
			.orderBy(order)
	]);
	const byId = new Map(designed.map((e) => [e.id, e]));
	const paired = new Set<string>();
	const pairs: StagePair[] = [];
	for (const b of built) {
		const d = b.design_element_id ? byId.get(b.design_element_id) : undefined;
		if (d) paired.add(d.id);
		pairs.push({
			design: d ? side(d) : null,
			asBuilt: side(b),
			changes: d ? await compareElementRows(db, { ...d, id: b.id }, b) : []
		});
	}
	for (const d of designed)
		if (!paired.has(d.id)) pairs.push({ design: side(d), asBuilt: null, changes: [] });
	const changed = pairs.filter((p) => !p.design || !p.asBuilt || p.changes.length > 0).length;
	return { design: brief(design), asBuilt: brief(asBuilt), pairs, changed };
}
