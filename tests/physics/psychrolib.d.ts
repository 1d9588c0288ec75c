// The parts of psychrolib (npm, ASHRAE Handbook psychrometrics) the physics tests use; it ships no types.
declare module 'psychrolib' {
	interface PsychroLib {
		SI: number;
		IP: number;
		SetUnitSystem(unitSystem: number): void;
		/** saturation vapour pressure over water (> 0.01 °C) or ice, Pa in SI */
		GetSatVapPres(dryBulb: number): number;
		/** dew-point temperature, °C in SI, from the dry-bulb temperature and the vapour pressure (Pa) */
		GetTDewPointFromVapPres(dryBulb: number, vapourPressure: number): number;
	}
	const psychrolib: PsychroLib;
	export default psychrolib;
}
