import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	EVIDENCE_WRITE_ROLES,
	listEvidence,
	listEvidenceRequests,
	openEvidenceUpload,
	uploadEvidence
} from '$lib/server/evidence';
import { answer } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** The dwelling's evidence (oldest first) and the evidence requests of its audits (newest first). */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const items = await listEvidence(member, event.params.dwellingId);
		if (!items) throw new NotFoundError('No such dwelling.');
		const requests = await listEvidenceRequests(member.organisationId, {
			dwellingId: event.params.dwellingId
		});
		return json({ items, requests });
	});

/**
 * Upload one file of evidence: multipart/form-data, the optional fields `elementId` and `layerIndex`
 * (0-based) first, then `file`. Read as it arrives; JPEG, PNG or PDF by content, at most 15 MB.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...EVIDENCE_WRITE_ROLES);
		const upload = await openEvidenceUpload(event.request, event.url);
		try {
			return json(await uploadEvidence(member, event.params.dwellingId, upload), { status: 201 });
		} finally {
			await upload.finish();
		}
	});
