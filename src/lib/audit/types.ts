/** What the audit of one dwelling reads (the bundle the server loads) and what it gives back. */
import type { ElementInput, ElementResult } from '$lib/physics';
import { type ElementKind } from '$lib/dwellings/kinds';
import type {
	ClimateMonthValues as ClimateMonthRow,
	StoredBuildUp,
	StoredInternal
} from '$lib/dwellings/element-input';
import type { Flag } from './flags';

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
	snapshot: { elements?: SnapshotElement[]; engineVersion?: string; issuedAt?: string };
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
	flags: Flag[];
};

export type RemovedElement = { id: string; name: string; kind: ElementKind; issued: Outcome | null };
