/**
 * Version of the calculation core; reports store it with their input snapshot. What each version
 * changed (the figures of an unchanged input change only where said):
 * - 1.3.0: results carry `plausibility` (warnings of unusual inputs, never refusals; figures
 *   unchanged); an optional `inclinationDeg` decides horizontal or vertical heat flow (ISO 6946:2017,
 *   6.8, note to Table 7); the ground's λ is stated with its source (`ground.groundLambdaSource`, a
 *   note) and the roof-space note names its table; the thickness solve says when a layer already
 *   meets the target and proposes a thinner one only when asked (`mode: 'thinnest'`).
 * - 1.2.0 and earlier: see the repository's history.
 */
export const ENGINE_VERSION = '1.3.0';

/** Cautions shown with every result and report. */
export const CAUTIONS: readonly string[] = [
	'U-values, temperatures and moisture checks are steady-state, one-dimensional calculations (ISO 6946, ISO 13788); they do not describe heat storage, thermal bridges at junctions or local effects around fixings and openings.',
	'The Glaser method (ISO 13788) considers vapour diffusion only. It ignores liquid transport and capillary suction, hygroscopic moisture storage, built-in and rain moisture, air movement through gaps and within air spaces, solar gains, night-sky cooling and the change of material properties with moisture content. Its results indicate risk; they are not predictions of actual moisture content.',
	'The surface-humidity check uses monthly mean conditions and the conventional internal surface resistance; furniture, corners and junctions can make surfaces colder.',
	'These results support, and do not replace, professional judgement. Check them against the local building codes and regulations, and against licensed practice, before relying on them.'
];
