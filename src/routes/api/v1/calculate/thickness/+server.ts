import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { ElementInputError, parseElementInput, solveThicknessDetailed } from '$lib/physics';
import { answer, readJson } from '$lib/server/http';
import { ValidationError } from '$lib/server/errors';
import { PRODUCT_THICKNESSES_MM, thicknessRequestSchema } from '$lib/dwellings/schema';
import { takeCalculation } from '$lib/server/rate-limit';

/**
 * Stateless: the thickness of one layer that reaches a target U, rounded up to a product size; when
 * the layer as entered already reaches it, says so (`outcome: 'meets'`) and proposes a thinner layer
 * only with `mode: 'thinnest'`.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireMember(event);
		takeCalculation(member.user.id);
		const body = thicknessRequestSchema.safeParse(await readJson(event.request));
		if (!body.success) {
			throw new ValidationError(
				body.error.issues.map((i) => ({ path: i.path.join('.') || '(body)', message: i.message }))
			);
		}
		const input = parseElementInput(body.data.input);
		if (!input.ok)
			throw new ValidationError(input.issues.map((i) => ({ path: `input.${i.path}`, message: i.message })));
		try {
			return json(
				solveThicknessDetailed(
					input.data,
					body.data.layerIndex,
					body.data.targetU,
					body.data.productThicknessesMm ?? PRODUCT_THICKNESSES_MM,
					{ mode: body.data.mode ?? 'meet' }
				)
			);
		} catch (e) {
			if (e instanceof ElementInputError) throw new ValidationError(e.issues);
			throw e;
		}
	}, event.request);
