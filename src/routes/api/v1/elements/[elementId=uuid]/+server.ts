import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { deleteElement, getElementContext, updateElement, withVerdict } from '$lib/server/dwellings/elements';
import { answer, readJson, versionParam } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** The element with its stored result, limit and pass/fail. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const ctx = await getElementContext(member.organisationId, event.params.elementId);
		if (!ctx) throw new NotFoundError();
		return json(withVerdict(ctx.element, ctx.limitTable));
	});

/** Replace the element's fields; the body carries `version` (409 when stale). The server recomputes. */
export const PUT = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await updateElement(member, event.params.elementId, await readJson(event.request)));
	});

/** ?version=N */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		await deleteElement(member, event.params.elementId, versionParam(event.url));
		return new Response(null, { status: 204 });
	});
