import { requireMember } from '$lib/server/guard';
import { analyseElement, parseElementInput, type ElementResult } from '$lib/physics';
import { answer, readJson } from '$lib/server/http';
import { ValidationError } from '$lib/server/errors';
import { takeCalculation } from '$lib/server/rate-limit';

/**
 * The answer without its bulk: every figure, check, note, warning and caution of the full result, less
 * the temperature profile points (`profile`), the per-month surface figures (`surface.months`) and the
 * per-month, per-node Glaser detail (`condensation.months`, `condensation.nodes`,
 * `condensation.vapourProfile`). About a seventh of the full answer's size, for callers that want the
 * outcome, not the charts.
 */
function summary(r: ElementResult): Record<string, unknown> {
	const out: Record<string, unknown> = { ...r };
	delete out.profile;
	if (r.surface) {
		const s: Record<string, unknown> = { ...r.surface };
		delete s.months;
		out.surface = s;
	}
	if (r.condensation) {
		const c: Record<string, unknown> = { ...r.condensation };
		delete c.months;
		delete c.nodes;
		delete c.vapourProfile;
		out.condensation = c;
	}
	return out;
}

const DETAILS = ['full', 'summary'] as const;

/**
 * Stateless: an element input (physics `ElementInput`) in, its result out; nothing is stored.
 * `?detail=summary` leaves out the profile and the per-month detail (see {@link summary}); the full
 * result is the default.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireMember(event);
		takeCalculation(member.user.id);
		const detail = event.url.searchParams.get('detail') ?? 'full';
		if (!(DETAILS as readonly string[]).includes(detail)) {
			throw new ValidationError([{ path: 'detail', message: 'must be full or summary' }]);
		}
		const parsed = parseElementInput(await readJson(event.request));
		if (!parsed.ok) throw new ValidationError(parsed.issues);
		// parseElementInput's output is not validated a second time inside analyseElement.
		const result = analyseElement(parsed.data);
		return new Response(JSON.stringify(detail === 'summary' ? summary(result) : result), {
			headers: { 'content-type': 'application/json' }
		});
	}, event.request);
