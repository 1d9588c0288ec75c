import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { setDwellingArchived, WRITE_ROLES } from '$lib/server/dwellings';
import { answer, readJson } from '$lib/server/http';
import { ValidationError } from '$lib/server/errors';
import { archiveSchema } from '$lib/dwellings/schema';

/** Archive or restore: body `{ archived: boolean, version }`. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		const body = archiveSchema.safeParse(await readJson(event.request));
		if (!body.success) {
			throw new ValidationError(
				body.error.issues.map((i) => ({ path: i.path.join('.') || '(body)', message: i.message }))
			);
		}
		return json(
			await setDwellingArchived(member, event.params.dwellingId, body.data.archived, body.data.version)
		);
	});
