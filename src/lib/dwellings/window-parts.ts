/**
 * A window's or door's parts kept with the element (the ISO 10077-1 input of `$lib/physics/window`):
 * the one rule for what U they give, the source text that names every part, and whether a given U
 * agrees with them. The editor, the server's validation, the report and the audit all use these.
 */
import {
	analyseWindow,
	FRAME_MATERIAL_LABELS,
	parseWindowInput,
	type WindowInput,
	type WindowResult
} from '$lib/physics/window';
import { fixedOrDash } from '$lib/figures';
import type { FieldIssue } from '$lib/validation';

/** U from the parts, rounded as a declared figure is given (two decimals), W/(m²·K). */
export const partsU = (r: WindowResult) => Math.round(r.uValue * 100) / 100;

/** The parts agree with a given U when it is their figure to two decimals. */
export const agreesWithParts = (givenU: number, r: WindowResult) => Math.abs(givenU - partsU(r)) < 0.005;

/** The source text of a U from its parts: the method, the unrounded figure and every part. */
export function windowPartsSource(input: WindowInput, r: WindowResult): string {
	const g = r.glazings[0];
	const f = r.frames[0];
	const p = r.panels[0];
	const parts = [
		g
			? `Ug ${g.uValue} over Ag ${g.areaM2} m², ψg ${g.psi} W/(m·K) (${g.psiSource}) over lg ${g.perimeterM} m`
			: null,
		f
			? `Uf ${f.uValue} (${f.uSource}) over Af ${f.areaM2} m²${input.frameMaterial ? `, ${FRAME_MATERIAL_LABELS[input.frameMaterial]}` : ''}`
			: null,
		p ? `Up ${p.uValue} over Ap ${p.areaM2} m², ψp ${p.psi} over lp ${p.perimeterM} m` : null
	].filter(Boolean);
	return `ISO 10077-1 from its parts: ${r.symbol} = ${fixedOrDash(r.uValue, 3)} W/(m²·K); ${parts.join('; ')}`.slice(
		0,
		300
	);
}

export type CheckedParts =
	| { ok: true; parts: WindowInput; result: WindowResult; u: number; source: string }
	| { ok: false; issues: FieldIssue[] };

/**
 * Stored parts checked for an element of `kind`: parsed by the window calculation (paths under
 * `windowParts.`), worked out, and compared with the given U when there is one (a different figure is
 * refused on `givenU`: the parts and the figure must tell the same story).
 */
export function checkWindowParts(raw: unknown, kind: 'window' | 'door', givenU: number | null): CheckedParts {
	const parsed = parseWindowInput({ ...(raw as object), kind });
	if (!parsed.ok)
		return {
			ok: false,
			issues: parsed.issues.map((i) => ({ path: `windowParts.${i.path}`, message: i.message }))
		};
	const result = analyseWindow(parsed.data);
	if (givenU !== null && !agreesWithParts(givenU, result))
		return {
			ok: false,
			issues: [
				{
					path: 'givenU',
					message: `is ${givenU} W/(m²·K), but the parts kept with it give ${partsU(result)}: use the parts’ figure, or remove the parts to give a declared value`
				}
			]
		};
	return {
		ok: true,
		parts: parsed.data,
		result,
		u: partsU(result),
		source: windowPartsSource(parsed.data, result)
	};
}
