/**
 * The junctions of a dwelling report's snapshot. At issue (and in a draft) each calculated junction is
 * computed again from its stored choices and the dwelling's elements as they are, as elements are, with
 * its temperature field sampled for the picture; the comparison with the issued record reads the
 * stored figures instead (`stored`), so that counting changes never solves a junction.
 */
import type { Db } from '$lib/server/db';
import type { JunctionField } from '$lib/physics/junction-field';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import { runJunction, type ElementLike } from '$lib/junctions/run';
import { fx } from '$lib/format';
import { ENGINE_VERSION } from '$lib/physics';
import type { SnapshotJunction } from './snapshot';
import type { ElementRow, JunctionRow } from '$lib/server/tables';

/**
 * How a snapshot takes its junctions: computed now with the picture's field (issue, draft); as last
 * saved (comparisons); or `check`, for a page that lists what stops an issue: as last saved when the
 * saved result is of this engine and of the elements as they are now, else computed now without the
 * field (the dwelling's climate is not compared: an edit of it marks the dwelling changed anyway).
 */
export type JunctionMode = 'calculate' | 'stored' | 'check';

/** Lines an axis of the sampled field besides the region edges: enough for a picture a column wide. */
export const REPORT_FIELD_LINES = 60;

/** The columns of an element row that the junction builder reads. */
export type JunctionElementRow = Pick<
	ElementRow,
	'id' | 'name' | 'kind' | 'heat_flow' | 'build_up' | 'given_u' | 'version'
>;

/** The dwelling's elements as the builder reads them. */
export function junctionElements(rows: JunctionElementRow[]): ElementLike[] {
	return rows.map((r) => ({
		id: r.id,
		name: r.name,
		kind: r.kind,
		heatFlow: r.heat_flow,
		buildUp: r.build_up,
		givenU: r.given_u,
		version: r.version
	}));
}

const round = (v: number, step: number) => Math.round(v / step) * step;
const r2 = (v: number) => Number(round(v, 0.01).toFixed(2));
const r3 = (v: number) => Number(round(v, 0.001).toFixed(3));

/** The field as the snapshot keeps it: coordinates to 0.001 mm, temperatures to 0.01 K. */
export function compactField(f: JunctionField): JunctionField {
	return {
		xs: f.xs.map(r3),
		ys: f.ys.map(r3),
		values: f.values.map((v) => (v === null ? null : r2(v))),
		cells: [...f.cells]
	};
}

function base(r: JunctionRow) {
	return {
		id: r.id,
		name: r.name,
		type: r.type,
		lengthM: r.length_m,
		source: r.source,
		dimensionSystem: r.dimension_system,
		psiEntered: r.psi_entered,
		psiSource: r.psi_source,
		details: r.details
	};
}

/** The junction's figures as printed (ψ and fRsi to 3 decimals): do two results say the same? */
const samePrinted = (a: number | null | undefined, b: number | null | undefined) =>
	fx(a ?? null, 3) === fx(b ?? null, 3);

/**
 * Every junction of the dwelling, in the order they were added. With `calculate` (and `check`), what
 * stops one being reported goes to `problems`: a model that cannot be built or computed, and a stored ψ or fRsi that the
 * dwelling's elements no longer give (the dwelling page shows the stored figures: the report must not
 * print others).
 */
export async function snapshotJunctions(
	trx: Db,
	organisationId: string,
	dwellingId: string,
	elementRows: JunctionElementRow[],
	months: ClimateMonthValues[] | null,
	mode: JunctionMode,
	problems: string[]
): Promise<SnapshotJunction[]> {
	const rows = await trx<JunctionRow>('junctions')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'created_at' }, { column: 'id' }])
		.select('*');
	if (!rows.length) return [];
	const elements = junctionElements(elementRows);
	return rows.map((r): SnapshotJunction => {
		const b = base(r);
		if (b.source === 'entered')
			return { ...b, details: null, model: null, psi: b.psiEntered, result: null, field: null };
		const stored = r.last_result;
		const version = new Map(elements.map((e) => [e.id, e.version]));
		const fresh =
			stored !== null &&
			stored.engineVersion === ENGINE_VERSION &&
			(stored.elements ?? []).every((e) => version.get(e.id) === e.version);
		if (mode === 'stored' || (mode === 'check' && fresh))
			return {
				...b,
				model: r.model,
				psi: stored?.psi ?? null,
				result: stored,
				field: null
			};
		const label = `Junction "${b.name}"`;
		const empty = {
			...b,
			model: r.model,
			psi: null,
			result: null,
			field: null
		};
		if (!b.details) {
			problems.push(`${label}: its builder choices are not recorded.`);
			return empty;
		}
		const run = runJunction({
			type: b.type,
			dimensionSystem: b.dimensionSystem,
			details: b.details,
			model: b.details.mode === 'free-form' ? r.model : undefined,
			elements,
			months,
			...(mode === 'calculate' ? { field: { maxLines: REPORT_FIELD_LINES } } : {})
		});
		if (!run.ok) {
			for (const issue of run.issues) problems.push(`${label}: ${issue.path}: ${issue.message}.`);
			return empty;
		}
		const result = run.result;
		if (
			stored &&
			(!samePrinted(stored.psi, result.psi) || !samePrinted(stored.surface?.fRsi, result.surface.fRsi))
		)
			problems.push(
				`${label}: the dwelling’s elements now give ψ ${fx(result.psi, 3)} W/(m·K) and fRsi ${fx(result.surface.fRsi, 3)}, not the ψ ${fx(stored.psi, 3)} and fRsi ${fx(stored.surface?.fRsi, 3)} saved with it: recalculate the junction on its page before issuing.`
			);
		return {
			...b,
			model: run.model,
			psi: result.psi,
			result,
			field: run.field ? compactField(run.field) : null
		};
	});
}
