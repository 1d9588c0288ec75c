/**
 * Which of an element's issues show beside their own field, and which are listed below the form; and
 * the plausibility warnings of a result by the field they concern.
 */
import type { ElementResult, PlausibilityWarning } from '$lib/physics';

export type Issue = { path: string; message: string };

/** Paths whose message shows beside its field (layers, ground and roof space have their own too). */
const SHOWN_AT_FIELD = [
	'name',
	'area',
	'givenU',
	'givenUSource',
	'internal.temperature',
	'internal.relativeHumidity',
	'internal.humidityClass',
	'inclinationDeg',
	'buildUp.inclinationDeg'
];

/**
 * Issues that no field shows, for the list under the form: each once, although the page's own check and
 * the server's answer often name the same one (a repeated key stops the list from rendering).
 */
export function issuesWithoutField(issues: Issue[]): Issue[] {
	const seen = new Set<string>();
	return issues.filter((i) => {
		const key = `${i.path}\u0000${i.message}`;
		if (seen.has(key)) return false;
		seen.add(key);
		return (
			!i.path.startsWith('buildUp.layers.') &&
			!i.path.startsWith('buildUp.ground.') &&
			i.path !== 'buildUp.roofSpace' &&
			!SHOWN_AT_FIELD.includes(i.path)
		);
	});
}

/** The layers' messages by path (`layers.2.thicknessMm`), for the build-up table. */
export function layerErrors<T>(byPath: Record<string, T>): Record<string, T> {
	return Object.fromEntries(Object.entries(byPath).filter(([k]) => k.startsWith('layers')));
}

/** What a plausibility warning says beside its field, in a few words (the result lists it in full). */
const SHORT: Record<PlausibilityWarning['check'], string> = {
	'layer-too-thick': 'Over 1 m: is the thickness in mm?',
	'layer-too-thin': 'Thinner than any product of its kind: is the thickness in mm?',
	'thickness-outside-range': 'Outside the thicknesses its material comes in.',
	'lambda-outside-range': 'Unusual λ for its category: check the value and unit.',
	'inside-temperature': 'Outside the usual 5–35 °C: check it.'
};

/** One field's plausibility warnings: a few words to show beside it, and the full text. */
export type FieldNotice = { short: string; full: string };

/**
 * A result's plausibility warnings by the input field they concern (`layers.2.thicknessMm`,
 * `internal.temperature`; the profile's design temperature counts as the inside temperature), those
 * of one field joined. Empty for no result, or one of an engine before 1.3.0.
 */
export function plausibilityByPath(result: ElementResult | null): Record<string, FieldNotice> {
	const out: Record<string, FieldNotice> = {};
	for (const w of result?.plausibility ?? []) {
		const path = w.path === 'designTemperatures.internal' ? 'internal.temperature' : w.path;
		const had = out[path];
		out[path] = had
			? { short: `${had.short} ${SHORT[w.check]}`, full: `${had.full} ${w.message}` }
			: { short: SHORT[w.check], full: w.message };
	}
	return out;
}
