/** Which of an element's issues show beside their own field, and which are listed below the form. */

export type Issue = { path: string; message: string };

/** Paths whose message shows beside its field (layers, ground and roof space have their own too). */
const SHOWN_AT_FIELD = [
	'name',
	'area',
	'givenU',
	'givenUSource',
	'internal.temperature',
	'internal.relativeHumidity',
	'internal.humidityClass'
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
export function layerErrors(byPath: Record<string, string>): Record<string, string> {
	return Object.fromEntries(Object.entries(byPath).filter(([k]) => k.startsWith('layers')));
}
