/** What the audit of one dwelling reads (the bundle the server loads) and what it gives back. */
import type { ElementInput, ElementResult } from '$lib/physics';
import { type ElementKind } from '$lib/dwellings/kinds';
import type {
	ClimateMonthValues as ClimateMonthRow,
	StoredBuildUp,
	StoredInternal
} from '$lib/dwellings/element-input';
import type { Flag } from './flags';
import type { JunctionType } from '$lib/junctions/kinds';
import type { JunctionFields } from '$lib/junctions/record';

/** A junction of the dwelling as stored: its fields and choices (the audit computes it again). */
export type AuditJunction = JunctionFields & {
	/** the free-form model (the builder's is built again from the elements) */
	model: unknown;
};

/** A junction as the issued report recorded it: its fields, its ψ and its fRsi. */
export type SnapshotJunction = Omit<AuditJunction, 'model'> & {
	model?: unknown;
	psi: number | null;
	fRsi?: number | null;
};

export type RevisionInfo = {
	id: string;
	materialId: string;
	code: string | null;
	revision: number;
	name: string;
	category: string;
	lambda: number | null;
	lambdaKind: string | null;
	resistance: number | null;
	muDry: number | null;
	sd: number | null;
	thicknessMinMm: number | null;
	thicknessMaxMm: number | null;
	status: string;
};

export type AuditElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: ElementInput['heatFlow'];
	buildUp: StoredBuildUp | null;
	givenU: number | null;
	givenUSource: string | null;
	/** a window's or door's ISO 10077-1 parts, when its U was worked out from them */
	windowParts?: unknown;
	internal: Partial<StoredInternal> | null;
	climateId: string | null;
};

export type SnapshotElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: ElementInput['heatFlow'];
	givenU?: number | null;
	givenUSource?: string | null;
	buildUp: StoredBuildUp | null;
	internal: Partial<StoredInternal> | null;
	climate: { id: string; months: ClimateMonthRow[] } | null;
	input: ElementInput | null;
	result: ElementResult | null;
	limit: number | null;
	pass: boolean | null;
	materialRevisions?: { layerIndex: number; materialId: string; revisionId: string; revision: number }[];
};

export type AuditReport = {
	id: string;
	number: string;
	revision: number;
	issuedAt: string;
	snapshot: {
		elements?: SnapshotElement[];
		/** absent (or null) from reports issued before junctions were reported */
		junctions?: SnapshotJunction[] | null;
		engineVersion?: string;
		issuedAt?: string;
	};
};

export type LimitTableInfo = { name: string; edition: string; limits: Partial<Record<ElementKind, number>> };

export type DwellingBundle = {
	dwellingId: string;
	climateId: string | null;
	elements: AuditElement[];
	report: AuditReport | null;
	limitTable: LimitTableInfo | null;
	climates: Map<string, ClimateMonthRow[]>;
	revisions: Map<string, RevisionInfo>;
	/** material id → its current revision */
	currentRevisions: Map<string, RevisionInfo>;
	/** the dwelling's junctions (none when absent) */
	junctions?: AuditJunction[];
};

/** The figures of one calculation that an auditor compares. */
export type Outcome = {
	u: number;
	uRounded: number;
	condensation: 'none' | 'dries' | 'accumulates' | null;
	maxAccumulation: number | null;
	surfacePass: boolean | null;
	fRsi: number | null;
	fRsiMin: number | null;
};

export type ElementRecompute = {
	elementId: string;
	name: string;
	kind: ElementKind;
	area: number;
	limit: number | null;
	givenU: number | null;
	issued: Outcome | null;
	used: Outcome | null;
	current: Outcome | null;
	reproduced: Outcome | null;
	inSnapshot: boolean;
	error?: string;
};

export type DwellingAudit = {
	engineVersion: string;
	reportId: string | null;
	reportNumber: string | null;
	reportRevision: number | null;
	issuedAt: string | null;
	limitTable: string | null;
	elements: ElementRecompute[];
	/** elements in the report that no longer exist */
	removedElements: RemovedElement[];
	/** the junctions recomputed, and those of the report no longer in the dwelling; absent when there are none */
	junctions?: JunctionRecompute[];
	removedJunctions?: RemovedJunction[];
	flags: Flag[];
};

/** The figures of a junction an auditor compares: ψ (W/(m·K)) and fRsi with its judgement. */
export type JunctionOutcome = {
	psi: number | null;
	fRsi: number | null;
	/** the critical month's fRsi,min of the dwelling's climate; null without a climate */
	fRsiMin: number | null;
	criticalMonth: number | null;
	/** fRsi ≥ fRsi,min; null without a climate */
	surfacePass: boolean | null;
	/** fRsi against the figure commonly used for dwellings (common practice, no source); null for an entered ψ */
	ruleOfThumb: { value: number; pass: boolean } | null;
};

export type JunctionRecompute = Pick<
	JunctionFields,
	'name' | 'type' | 'lengthM' | 'source' | 'dimensionSystem' | 'psiSource'
> & {
	junctionId: string;
	/** what the report issued: its ψ and fRsi */
	issued: { psi: number | null; fRsi: number | null } | null;
	/** computed today from the stored choices and the dwelling's elements (an entered ψ as entered) */
	current: JunctionOutcome | null;
	inSnapshot: boolean;
	error?: string;
};

export type RemovedJunction = {
	id: string;
	name: string;
	type: JunctionType;
	issued: { psi: number | null; fRsi: number | null };
};

export type RemovedElement = { id: string; name: string; kind: ElementKind; issued: Outcome | null };
