import { requireMember } from '$lib/server/guard';
import { analyseJunction, parseJunctionInput } from '$lib/physics/junction';
import { answer, readJson } from '$lib/server/http';
import { ValidationError } from '$lib/server/errors';
import { takeCalculation } from '$lib/server/rate-limit';
import { issuesSentence } from '$lib/validation';

/**
 * Stateless: a two-dimensional junction model (the engine's `JunctionInput`: regions, boundaries,
 * environments, flanks, probes) in, its result (ISO 10211: heat flows, L2D, ψ, fRsi, coldest point,
 * mesh, method, cautions, notes) out; nothing is stored. Counted against the member's calculations.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireMember(event);
		takeCalculation(member.user.id);
		const parsed = parseJunctionInput(await readJson(event.request));
		if (!parsed.ok) throw new ValidationError(parsed.issues, issuesSentence(parsed.issues, 'junction model'));
		// parseJunctionInput's data is validated once more inside analyseJunction: it is cheap beside the solve.
		return new Response(JSON.stringify(analyseJunction(parsed.data)), {
			headers: { 'content-type': 'application/json' }
		});
	}, event.request);
