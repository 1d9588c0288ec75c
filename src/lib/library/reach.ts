/**
 * The reach of a library correction (which elements still use an older revision of a material, with their
 * results now and with the current revision), as the library service returns it and the material page
 * shows it: one shape for both sides.
 */
import type { DwellingStatus, ElementKind } from '$lib/dwellings/kinds';

/** The headline figures of a result: U (W/(m²·K)), as reported, the Glaser outcome and the fRsi check. */
export type ReachOutcome = {
	u: number | null;
	uRounded: number | null;
	moisture: 'none' | 'dries' | 'accumulates' | null;
	surfacePass: boolean | null;
};

export type ReachElement = {
	id: string;
	name: string;
	kind: ElementKind;
	position: number;
	/** the element's version, for a save that states what it loaded */
	version: number;
	/** the layers of the material on an older revision */
	layers: { layerIndex: number; fromRevisionId: string; fromRevision: number }[];
	/** maximum U for the kind from the dwelling's limit table, W/(m²·K) */
	limit: number | null;
	/** the stored result */
	now: ReachOutcome & { pass: boolean | null };
	/** recomputed with the current revision; null when that calculation fails (`error`) */
	next: (ReachOutcome & { pass: boolean | null }) | null;
	error: string | null;
	passFlip: 'to-fail' | 'to-pass' | null;
	moistureChanged: boolean;
	surfaceChanged: boolean;
	/** the stored result was calculated by another engine version */
	stale: boolean;
};

export type ReachDwelling = {
	id: string;
	reference: string;
	address: string;
	status: DwellingStatus;
	statusLabel: string;
	reopened: boolean;
	/** accepted, or awaiting review and not reopened: a change needs reopening with a reason first */
	needsReopening: boolean;
	/** why the dwelling may not change now, if it may not */
	refusal: string | null;
	issuedReports: number;
	lastIssuedAt: string | null;
	/** differences from the latest issued dwelling report (null before the first issue) */
	changesSinceIssue: number | null;
	/** the latest audit decision on the dwelling, in any batch */
	auditDecision: string | null;
	/** the dwelling's latest audit item: `open` while it waits for a decision in an open batch */
	audit: {
		itemId: string;
		batchId: string;
		batchName: string;
		open: boolean;
		decision: string | null;
		decidedAt: string | null;
	} | null;
	limitTable: { id: string; name: string; edition: string } | null;
	elements: ReachElement[];
};

export type ReachTotals = {
	elements: number;
	dwellings: number;
	flips: number;
	toFail: number;
	toPass: number;
	moistureChanges: number;
	surfaceChanges: number;
	errors: number;
	withIssuedReports: number;
	needsReopening: number;
	accepted: number;
	/** dwellings whose latest audit item waits for a decision in an open batch */
	inOpenAudit: number;
	/** elements whose stored result is from another engine version */
	staleResults: number;
};

export type Reach = {
	material: { id: string; code: string; name: string };
	/** the current revision, which the elements would move to */
	to: { id: string; revision: number; status: string };
	/** the numbers of the older revisions */
	olderRevisions: number[];
	/**
	 * When the current revision is itself superseded (not for new work, no newer revision yet): how much
	 * work uses it. Null otherwise.
	 */
	onSupersededCurrent: { elements: number; dwellings: number } | null;
	totals: ReachTotals;
	/** how many different engine inputs were calculated */
	distinctInputs: number;
	dwellings: ReachDwelling[];
};

export type ReachCount = {
	materialId: string;
	code: string;
	/** the current revision's number */
	revision: number;
	elements: number;
	dwellings: number;
};

/** One page of the reach's dwellings, the totals those of every dwelling. */
export type ReachPage = Reach & { page: number; pageSize: number; pages: number };
