import { fail } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { listReturned, resubmitItem } from '$lib/server/audit';
import { resubmitSchema } from '$lib/audit/schemas';
import { AppError } from '$lib/server/errors';

export async function load(event) {
	const member = requireMember(event);
	return { items: await listReturned(member) };
}

export const actions = {
	resubmit: async (event) => {
		const member = requireMember(event);
		const f = await event.request.formData();
		const itemId = String(f.get('itemId') ?? '');
		const raw = { comment: String(f.get('comment') ?? '') };
		const parsed = resubmitSchema.safeParse(raw);
		if (!parsed.success)
			return fail(400, {
				itemId,
				comment: raw.comment,
				error: `Comment: ${parsed.error.issues[0].message}.`
			});
		if (!/^[0-9a-f-]{36}$/i.test(itemId))
			return fail(400, { itemId, comment: raw.comment, error: 'No such audit item.' });
		try {
			const item = await resubmitItem(member, itemId, parsed.data);
			return { resubmitted: item.reference };
		} catch (e) {
			if (e instanceof AppError) return fail(e.status, { itemId, comment: raw.comment, error: e.message });
			throw e;
		}
	}
};
