import { requireMember } from '$lib/server/guard';
import { listBatches, listChangedAfterDecision, listReturned } from '$lib/server/audit';

export async function load(event) {
	const member = requireMember(event);
	const [batches, returned, changed] = await Promise.all([
		listBatches(member.organisationId),
		listReturned(member),
		listChangedAfterDecision(member.organisationId)
	]);
	return { batches, returnedCount: returned.length, changed };
}
