/**
 * An evidence file and a supervisor's request for evidence, as the evidence service lists them and the
 * dwelling and audit pages show them (one shape for both sides).
 */

export type Evidence = {
	id: string;
	dwellingId: string;
	elementId: string | null;
	elementName: string | null;
	/** 0-based position in the element's build-up when the file was uploaded */
	layerIndex: number | null;
	layerName: string | null;
	name: string;
	/** one of the accepted types (the service's EVIDENCE_TYPES) */
	contentType: string;
	bytes: number;
	sha256: string;
	uploadedBy: { id: string; name: string | null };
	createdAt: string;
	/** when it was first listed in an issued report (then it is kept), or null */
	reportedAt: string | null;
	url: string;
	thumbnailUrl: string | null;
	/** whether the caller may delete it now */
	deletable: boolean;
};

export type EvidenceRequest = {
	id: string;
	dwellingId: string;
	auditItemId: string;
	batchId: string;
	requestedBy: { id: string; name: string | null };
	note: string;
	dueDate: string;
	createdAt: string;
	answeredAt: string | null;
	answeredBy: { id: string; name: string | null } | null;
	answerEvidenceId: string | null;
	/** open and past its due date (UTC) */
	overdue: boolean;
};
