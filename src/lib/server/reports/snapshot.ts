/**
 * What an issued report freezes: every input, every result, the engine version, the library
 * revisions and the limit table. The PDF is rendered from this alone, so a re-render of a stored
 * snapshot prints the same numbers.
 */
import type { WindowInput, WindowResult } from '$lib/physics/window';
import type { ElementInput, ElementResult, HeatFlow } from '$lib/physics';
import { type ElementKind } from '$lib/dwellings/kinds';
import type { StoredBuildUp, StoredInternal } from '$lib/dwellings/element-input';
import type { EvidenceForReport } from '$lib/server/evidence';
import type { JunctionInput } from '$lib/physics/junction-schema';
import type { JunctionField } from '$lib/physics/junction-field';
import type { JunctionCalculation } from '$lib/junctions/calculate';
import type { JunctionFields } from '$lib/junctions/record';

export type ReportScope = 'element' | 'dwelling';

export type SnapshotClimate = {
	id: string;
	name: string;
	source: string;
	illustrative: boolean;
	months: { month: number; temperature: number; relativeHumidity: number }[];
};

export type SnapshotLimitTable = {
	id: string;
	name: string;
	edition: string;
	dated: string | null;
	source: string | null;
	limits: Partial<Record<ElementKind, number>>;
};

export type SnapshotMaterialRevision = {
	layerIndex: number;
	materialId: string;
	revisionId: string;
	revision: number;
	code: string | null;
	name: string | null;
	manufacturer: string | null;
	lambdaKind: string | null;
	source: string | null;
};

export type SnapshotElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: HeatFlow;
	givenU?: number | null;
	givenUSource?: string | null;
	/** a window's or door's ISO 10077-1 parts and their calculation, when its U was worked out from them */
	windowParts?: { input: WindowInput; result: WindowResult };
	buildUp: StoredBuildUp | null;
	internal: StoredInternal | null;
	climate: SnapshotClimate | null;
	input: ElementInput | null;
	result: ElementResult | null;
	/** the U-value compared with the limit: the rounded result, or the given value */
	u: number | null;
	limit: number | null;
	pass: boolean | null;
	materialRevisions: SnapshotMaterialRevision[];
};

export type SnapshotEvidence = EvidenceForReport;

/**
 * A junction as the dwelling report freezes it: its stored fields, and for a calculated one the model
 * and result computed at issue from the dwelling's elements as they were then, with the temperature
 * field sampled for the picture (temperatures rounded to 0.01 K).
 */
export type SnapshotJunction = JunctionFields & {
	/** the model computed: built from the elements, or free-form (null for an entered ψ) */
	model: JunctionInput | null;
	/** ψ in the heat loss, W/(m·K): the calculated one in the junction's dimension system, or the entered one */
	psi: number | null;
	result: JunctionCalculation | null;
	field: JunctionField | null;
};

export type ReportSnapshot = {
	dwelling: {
		id: string;
		reference: string;
		address: string;
		programme: string | null;
		stage: string;
		clientName: string | null;
		clientEmail: string | null;
		assessor: { id: string; name: string; email: string; registrationNumber: string | null } | null;
	};
	organisation: { id: string; name: string };
	limitTable: SnapshotLimitTable | null;
	elements: SnapshotElement[];
	/**
	 * The evidence files kept with the dwelling when the report was issued (name and SHA-256 of each).
	 * Absent from snapshots frozen before evidence was listed.
	 */
	evidence?: SnapshotEvidence[];
	/**
	 * The dwelling's junctions (dwelling reports only). Absent from snapshots frozen before junctions
	 * were reported; those render as they were issued, without the heat loss of junctions.
	 */
	junctions?: SnapshotJunction[];
	engineVersion: string;
	issuedAt: string;
	/** identity of the document itself, frozen with the data */
	document: {
		scope: ReportScope;
		draft: boolean;
		number: string;
		revision: number;
		verificationCode: string | null;
		verifyUrl: string | null;
		supersedes: { number: string; revision: number; issuedAt: string } | null;
		/**
		 * Who issued it, and so who makes the declaration: name and registration number as they were at
		 * issue. `registrationNumber` is absent from snapshots frozen before the declaration named the
		 * issuer; those print the dwelling's assessor in the declaration, as they did when issued.
		 */
		issuedBy: { id: string; name: string; registrationNumber?: string | null };
	};
};
