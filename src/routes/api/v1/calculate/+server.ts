import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { analyseElement, parseElementInput } from '$lib/physics';
import { handle, readJson } from '$lib/dwellings/api';
import { ValidationError } from '$lib/dwellings/errors';

/** Stateless: an element input (physics `ElementInput`) in, its result out; nothing is stored. */
export const POST = (event) =>
	handle(async () => {
		requireMember(event);
		const parsed = parseElementInput(await readJson(event.request));
		if (!parsed.ok) throw new ValidationError(parsed.issues);
		return json(analyseElement(parsed.data));
	});
