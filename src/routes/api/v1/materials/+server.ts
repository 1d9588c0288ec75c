import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createMaterial, listMaterials } from '$lib/server/library';
import { fieldIssues, listQuerySchema } from '$lib/library/schema';
import { failure, readJson } from './respond';

/** The library list: ?q=&category=&status=&page=&pageSize=&sort= → { items, total, page, pageSize }. */
export const GET = async (event) => {
	const member = requireMember(event);
	const parsed = listQuerySchema.safeParse(Object.fromEntries(event.url.searchParams));
	if (!parsed.success)
		return json({ message: 'The query is not right.', issues: fieldIssues(parsed.error) }, { status: 400 });
	return json(await listMaterials(member.organisationId, parsed.data));
};

/** Add a material: its values (and confirmWarnings: true when the values are unusual but right). */
export const POST = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const body = await readJson(event.request);
	if (!body.ok) return body.response;
	const { confirmWarnings, ...values } = body.body;
	try {
		const created = await createMaterial(
			{ userId: member.user.id, organisationId: member.organisationId },
			values,
			{
				confirmWarnings: confirmWarnings === true
			}
		);
		return json(created, { status: 201 });
	} catch (e) {
		return failure(e);
	}
};
