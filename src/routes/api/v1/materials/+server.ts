import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createMaterial, listMaterials } from '$lib/server/library';
import { answer, parseWith, readJsonObject } from '$lib/server/http';
import { listQuerySchema } from '$lib/library/schema';

/** The library list: ?q=&category=&status=&page=&pageSize=&sort= → { items, total, page, pageSize }. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const query = parseWith(listQuerySchema, Object.fromEntries(event.url.searchParams), 'query');
		return json(await listMaterials(member.organisationId, query));
	});

/** Add a material: its values (and confirmWarnings: true when the values are unusual but right). */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, 'assessor', 'admin');
		const { confirmWarnings, ...values } = await readJsonObject(event.request);
		const created = await createMaterial(
			{ userId: member.user.id, organisationId: member.organisationId },
			values,
			{ confirmWarnings: confirmWarnings === true }
		);
		return json(created, { status: 201 });
	});
