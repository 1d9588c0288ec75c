import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { answerEvidenceRequest } from '$lib/server/evidence';
import { answer, readJson } from '$lib/server/http';

/**
 * Mark a request answered without a new upload (an upload to the dwelling answers it by itself):
 * `{ evidenceId? }` names evidence of the dwelling that answers it.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const body = await readJson(event.request);
		return json(await answerEvidenceRequest(member, event.params.itemId, event.params.requestId, body));
	});
