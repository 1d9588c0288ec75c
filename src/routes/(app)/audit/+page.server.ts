import { requireMember } from '$lib/server/guard';
import { listBatches, listReturned } from '$lib/server/audit';

export async function load(event) {
	const member = requireMember(event);
	const [batches, returned] = await Promise.all([listBatches(member.organisationId), listReturned(member)]);
	return { batches, returnedCount: returned.length };
}
