/** Version of the calculation core; reports store it with their input snapshot. */
export const ENGINE_VERSION = '1.2.0';

/** Cautions shown with every result and report. */
export const CAUTIONS: readonly string[] = [
	'U-values, temperatures and moisture checks are steady-state, one-dimensional calculations (ISO 6946, ISO 13788); they do not describe heat storage, thermal bridges at junctions or local effects around fixings and openings.',
	'The Glaser method (ISO 13788) considers vapour diffusion only. It ignores liquid transport and capillary suction, hygroscopic moisture storage, built-in and rain moisture, air movement through gaps and within air spaces, solar gains, night-sky cooling and the change of material properties with moisture content. Its results indicate risk; they are not predictions of actual moisture content.',
	'The surface-humidity check uses monthly mean conditions and the conventional internal surface resistance; furniture, corners and junctions can make surfaces colder.',
	'These results support, and do not replace, professional judgement. Check them against the local building codes and regulations, and against licensed practice, before relying on them.'
];
