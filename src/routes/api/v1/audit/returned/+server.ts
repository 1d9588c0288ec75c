import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { listReturned } from '$lib/server/audit';

/** Dwellings returned to the caller (admins: every returned dwelling of the organisation). */
export async function GET(event) {
	const member = requireMember(event);
	return json({ items: await listReturned(member) });
}
