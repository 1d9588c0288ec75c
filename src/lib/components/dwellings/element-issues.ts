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
	'buildUp.inclinationDeg',
	'buildUp.rsi',
	'buildUp.rse',
	'buildUp.surfaceConditions.internalEmissivity',
	'buildUp.surfaceConditions.externalEmissivity',
	'buildUp.surfaceConditions.windSpeed'
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

/* ------------------------------------------------------------------ field names as the screen shows them */

/** How the page names a field, the unit it is typed in, and a typical value to show in a hint. */
type FieldInfo = { label: string; unit?: string; example?: string };

// Typical values in the hints are common practice, no source: they only show the form of a number.
const ELEMENT_FIELDS: Record<string, FieldInfo> = {
	name: { label: 'Name' },
	kind: { label: 'Kind' },
	area: { label: 'Area', unit: 'm²', example: '12.5' },
	heatFlow: { label: 'Heat flow' },
	position: { label: 'Position' },
	climateId: { label: 'Climate' },
	internal: { label: 'Inside conditions' },
	'internal.temperature': { label: 'Inside temperature', unit: '°C', example: '20' },
	'internal.relativeHumidity': { label: 'Relative humidity', unit: '%', example: '50' },
	'internal.humidityClass': { label: 'Humidity class' },
	givenU: { label: 'Given U', unit: 'W/(m²·K)', example: '1.4' },
	givenUSource: { label: 'Source of the value' },
	buildUp: { label: 'Build-up' },
	layers: { label: 'Build-up' },
	rsi: { label: 'Rsi override', unit: 'm²·K/W', example: '0.13' },
	rse: { label: 'Rse override', unit: 'm²·K/W', example: '0.04' },
	surfaceConditions: { label: 'Other surface conditions' },
	'surfaceConditions.internalEmissivity': { label: 'Inside surface emissivity', example: '0.9' },
	'surfaceConditions.externalEmissivity': { label: 'Outside surface emissivity', example: '0.9' },
	'surfaceConditions.windSpeed': { label: 'Wind speed at the outside surface', unit: 'm/s', example: '4' },
	windowParts: { label: 'Parts of the window or door' },
	roofSpace: { label: 'Roof space above the ceiling' },
	inclinationDeg: { label: 'Inclination', unit: '°', example: '35' },
	ground: { label: 'Ground floor' },
	'ground.perimeterM': { label: 'Exposed perimeter', unit: 'm', example: '24' },
	'ground.areaM2': { label: 'Floor area', unit: 'm²', example: '40' },
	'ground.groundLambda': { label: 'Ground λ', unit: 'W/(m·K)', example: '2.0' },
	'ground.wallThicknessM': { label: 'Wall thickness', unit: 'mm', example: '300' },
	'ground.suspended': { label: 'Suspended floor' },
	'ground.suspended.heightM': { label: 'Deck above ground', unit: 'mm', example: '300' },
	'ground.suspended.underfloorWallU': { label: 'Underfloor wall U', unit: 'W/(m²·K)', example: '1.7' },
	'ground.suspended.openingsPerPerimeter': {
		label: 'Vents per m of perimeter',
		unit: 'mm² per m',
		example: '3000'
	},
	'ground.suspended.windSpeed': { label: 'Wind speed', unit: 'm/s', example: '4' },
	'ground.suspended.windShielding': { label: 'Wind shielding' },
	'ground.basement': { label: 'Basement' },
	'ground.basement.kind': { label: 'Basement type' },
	'ground.basement.depthM': { label: 'Basement depth', unit: 'mm', example: '1500' },
	'ground.basement.wallR': { label: 'Basement wall Rw', unit: 'm²·K/W', example: '0.5' },
	'ground.basement.floorR': { label: 'Basement floor Rf', unit: 'm²·K/W', example: '0.2' },
	'ground.basement.wallAboveGroundHeightM': { label: 'Wall above ground', unit: 'mm', example: '500' },
	'ground.basement.wallAboveGroundU': { label: 'Wall above ground U', unit: 'W/(m²·K)', example: '1.5' },
	'ground.basement.airChangeRate': { label: 'Basement air change', unit: 'h⁻¹', example: '0.3' },
	'ground.basement.volumeM3': { label: 'Basement volume', unit: 'm³', example: '120' },
	'ground.edge': { label: 'Edge insulation' },
	'ground.edge.orientation': { label: 'Edge insulation type' },
	'ground.edge.widthM': { label: 'Edge insulation width or depth', unit: 'mm', example: '600' },
	'ground.edge.insulationThicknessM': { label: 'Edge insulation thickness', unit: 'mm', example: '50' },
	'ground.edge.insulationR': { label: 'Edge insulation Rn', unit: 'm²·K/W', example: '1.5' },
	'ground.edge.insulationLambda': { label: 'Edge insulation λ', unit: 'W/(m·K)', example: '0.035' },
	unheatedSpace: { label: 'Unheated space' },
	'unheatedSpace.internalAreaM2': { label: 'Area between the spaces Ai', unit: 'm²', example: '12' },
	'unheatedSpace.externalElements': { label: 'Outer elements of the unheated space' },
	'unheatedSpace.airChangeRate': { label: 'Air change rate n', unit: 'h⁻¹', example: '1' },
	'unheatedSpace.airtightness': { label: 'Air change of the space' },
	'unheatedSpace.volumeM3': { label: 'Volume of the space', unit: 'm³', example: '60' }
};

/** An outer element of the unheated space's fields, after `unheatedSpace.externalElements.N.`. */
const OUTER_FIELDS: Record<string, FieldInfo> = {
	name: { label: 'name' },
	areaM2: { label: 'area', unit: 'm²', example: '6' },
	uValue: { label: 'U', unit: 'W/(m²·K)', example: '1.5' }
};

/** A layer's fields, after `layers.N.` (the row's boxes and its bridging and corrections rows). */
const LAYER_FIELDS: Record<string, FieldInfo> = {
	name: { label: 'name' },
	thicknessMm: { label: 'thickness', unit: 'mm', example: '100' },
	lambda: { label: 'λ', unit: 'W/(m·K)', example: '0.035' },
	resistance: { label: 'thermal resistance', unit: 'm²·K/W', example: '0.18' },
	air: { label: 'air layer' },
	openingAreaMm2: { label: 'openings', unit: 'mm²', example: '500' },
	mu: { label: 'μ', example: '10' },
	sd: { label: 'sd-value', unit: 'm', example: '0.5' },
	airGapLevel: { label: 'air-gap level' },
	bridge: { label: 'bridging' },
	'bridge.name': { label: 'bridging material' },
	'bridge.lambda': { label: 'bridging λ', unit: 'W/(m·K)', example: '0.13' },
	'bridge.fraction': { label: 'bridging fraction', example: '0.12' },
	'bridge.widthMm': { label: 'member width', unit: 'mm', example: '38' },
	'bridge.centresMm': { label: 'member centres', unit: 'mm', example: '600' },
	'bridge.mu': { label: 'bridging μ', example: '50' },
	bridgeGeometry: { label: 'bridging width and centres' },
	'bridgeGeometry.widthMm': { label: 'member width', unit: 'mm', example: '38' },
	'bridgeGeometry.centresMm': { label: 'member centres', unit: 'mm', example: '600' },
	bridgeMaterial: { label: 'bridging material from the library' },
	fasteners: { label: 'fasteners' },
	'fasteners.lambda': { label: 'fastener λ', unit: 'W/(m·K)', example: '50' },
	'fasteners.areaMm2': { label: 'fastener diameter', unit: 'mm', example: '4' },
	'fasteners.perM2': { label: 'fasteners per m²', example: '4' },
	'fasteners.penetrationMm': { label: 'fastener length in the layer', unit: 'mm', example: '50' },
	fastenerDiameterMm: { label: 'fastener diameter', unit: 'mm', example: '4' },
	density: { label: 'density ρ (layer details)', unit: 'kg/m³', example: '30' },
	specificHeat: { label: 'specific heat c (layer details)', unit: 'J/(kg·K)', example: '1030' },
	materialId: { label: 'library material' },
	materialRevisionId: { label: 'library material' },
	materialCode: { label: 'library material' },
	plausible: { label: 'library ranges' }
};

/** camelCase or a path's pieces in plain words, for a field no table names (never a dotted path). */
function words(path: string): string {
	const parts = path
		.split('.')
		.filter((p) => p !== '' && !/^\d+$/.test(p))
		.map((p) =>
			p
				.replace(/Mm2$/, ' (mm²)')
				.replace(/Mm$/, ' (mm)')
				.replace(/M2$/, ' (m²)')
				.replace(/([a-z])([A-Z])/g, '$1 $2')
				.toLowerCase()
		);
	const text = parts.join(', ') || 'element';
	return text.charAt(0).toUpperCase() + text.slice(1);
}

type Located = { label: string; info: FieldInfo };

function locate(rawPath: string): Located {
	const path = rawPath.replace(/^buildUp\./, '');
	if (path === '' || path === '(body)' || path === '(input)' || path === '_')
		return { label: 'Element', info: { label: 'Element' } };
	const layer = /^layers\.(\d+)(?:\.(.+))?$/.exec(path);
	if (layer) {
		const n = Number(layer[1]) + 1;
		if (!layer[2]) return { label: `Layer ${n}`, info: { label: `Layer ${n}` } };
		const rest = layer[2];
		const info = LAYER_FIELDS[rest] ??
			LAYER_FIELDS[rest.split('.')[0]] ?? { label: words(rest).toLowerCase() };
		return { label: `Layer ${n}, ${info.label}`, info };
	}
	const outer = /^unheatedSpace\.externalElements\.(\d+)(?:\.(.+))?$/.exec(path);
	if (outer) {
		const n = Number(outer[1]) + 1;
		const info = (outer[2] && OUTER_FIELDS[outer[2]]) || { label: 'element' };
		return { label: `Outer element ${n}, ${info.label}`, info };
	}
	const climate = /^climate(?:\.(\d+))?/.exec(path);
	if (climate) return { label: 'Climate', info: { label: 'Climate' } };
	if (path.startsWith('designTemperatures'))
		return { label: 'Inside temperature', info: ELEMENT_FIELDS['internal.temperature'] };
	const info = ELEMENT_FIELDS[path] ?? { label: words(path) };
	return { label: info.label, info };
}

/** The name the screen gives the field at `path` (`buildUp.layers.2.bridgeGeometry.widthMm` → "Layer 3, member width"). */
export function fieldLabel(path: string): string {
	return locate(path).label;
}

/** Internal field names that the engine's messages mention, in the screen's words. */
const NAMES_IN_TEXT: [RegExp, string][] = [
	[/\bfraction or widthMm and centresMm\b/g, 'the fraction or the member width and centres'],
	[/\bwidthMm and centresMm\b/g, 'the member width and centres in mm'],
	[/\bwidthMm\b/g, 'the member width'],
	[/\bcentresMm\b/g, 'the member centres'],
	[/\bperimeterM \(m\)/g, 'the exposed perimeter (m)'],
	[/\bareaM2 \(m²\)/g, 'the floor area (m²)'],
	[/\bperimeterM\b/g, 'the exposed perimeter'],
	[/\bareaM2\b/g, 'the floor area'],
	[/\brelativeHumidity or humidityClass\b/g, 'the relative humidity or the humidity class'],
	[/\brelativeHumidity\b/g, 'the relative humidity'],
	[/\bhumidityClass\b/g, 'the humidity class'],
	[/\blambdaMin\b/g, 'the smallest λ'],
	[/\bthicknessMinMm\b/g, 'the smallest thickness'],
	[/\(also at climate\.(\d+)\)/g, '(also in another row)']
];

const plainNames = (m: string) => NAMES_IN_TEXT.reduce((t, [re, to]) => t.replace(re, to), m);

/**
 * What a message says to do, in the screen's words, without the field's name (the field shows it, or
 * `labelledIssue` puts it in front): "must be a finite number, got the text "abc"" for a member width
 * becomes "enter a number in mm, e.g. 38 (“abc” is not a number)".
 */
export function issueText(path: string, message: string): string {
	const { info } = locate(path);
	const unit = info.unit ? ` in ${info.unit}` : '';
	const eg = info.example ? `, e.g. ${info.example}` : '';
	const m = message.trim();
	const simplePath = path.replace(/^buildUp\./, '');

	if (simplePath === 'buildUp' || simplePath === 'layers') {
		if (/at least one layer/.test(m)) return 'add at least one layer (Add layer, or paste rows)';
	}
	const notNumber = /^must be (?:a finite number|a number)(?: in [^,]+)?(?:, got (.*))?$/.exec(m);
	if (notNumber) {
		const got = notNumber[1];
		const quoted = got ? /^the text "(.*)"$/.exec(got) : null;
		const why = quoted ? ` (“${quoted[1]}” is not a number)` : got ? ` (${got} is not a number)` : '';
		return `enter a number${unit}${eg}${why}`;
	}
	if (m === 'must be text') return 'enter text';
	if (m === 'is required') {
		if (simplePath === 'name') return 'enter a name for the element';
		return info.unit || info.example ? `enter a number${unit}${eg}` : 'fill this in';
	}
	// typed as a diameter, checked as the cross-section it gives
	if (/fasteners\.areaMm2$/.test(simplePath) && /mm²/.test(m))
		return `enter a smaller diameter: the cross-section it gives ${m.replace(/^must be ≤/, 'may be at most')}`;
	let t = plainNames(m);
	let r: RegExpExecArray | null;
	if ((r = /^is required with (.+)$/.exec(t))) return `enter it as well as ${r[1]}`;
	if ((r = /^is required: (.+)$/.exec(t))) return `enter ${r[1].replace(/, ([^\s,]+)$/, ' in $1')}`;
	if ((r = /^is required (for .+)$/.exec(t))) return `enter a number${unit}${eg}: it is required ${r[1]}`;
	if ((r = /^must not exceed (.+)$/.exec(t))) return `enter a number no more than ${r[1]}`;
	if ((r = /^must be at most (\d[\d,\s]*) characters(?:, got (\d+))?$/.exec(t)))
		return `shorten it to at most ${r[1]} characters${r[2] ? ` (it has ${r[2]})` : ''}`;
	if ((r = /^must be (?:an id|a material id|a material revision id)$/.exec(t)))
		return 'choose one from the list';
	if ((r = /^must be one of (.+)$/.exec(t))) return `choose one of ${r[1]}`;
	const withUnit = (x: string) => (info.unit && /^[\d.\s]+$/.test(x) ? `${x} ${info.unit}` : x);
	if ((r = /^must be > (.+)$/.exec(t))) return `enter a number above ${withUnit(r[1])}`;
	if ((r = /^must be ≥ (.+)$/.exec(t))) return `enter a number of at least ${withUnit(r[1])}`;
	if ((r = /^must be ≤ (.+)$/.exec(t))) return `enter a number of at most ${withUnit(r[1])}`;
	if ((r = /^must be between (.+?)(?: \(exclusive\))?$/.exec(t)))
		return `enter a number between ${r[1]}${/\(exclusive\)$/.test(t) ? ', not either end' : ''}${eg}`;
	if ((r = /^must be (over|at least|at most|smaller than|greater than|below) (.+)$/.exec(t)))
		return `enter a number ${r[1].startsWith('at ') ? 'of ' : ''}${r[1]} ${withUnit(r[2])}`;
	if ((r = /^must be (a whole number.*|\d.*)$/.exec(t))) return `enter ${r[1]}`;
	if ((r = /^must be (.+ or .+)$/.exec(t))) return `choose ${r[1]}`;
	if ((r = /^must be (.+)$/.exec(t))) return `enter ${r[1]}`;
	return t;
}

/** A message as a person reads it anywhere on the element page: "Layer 3, member width: enter a number in mm, e.g. 38". */
export function labelledIssue(i: Issue): string {
	return `${fieldLabel(i.path)}: ${issueText(i.path, i.message)}`;
}

/**
 * The issues the page shows, each message in the screen's words (the path is kept, for placing it
 * beside its field), without the ones another message already covers: a bridge given by width and
 * centres whose width is not a number has no fraction either, and saying so again helps nobody.
 */
export function shownIssues(issues: Issue[]): Issue[] {
	const paths = new Set(issues.map((i) => i.path.replace(/^buildUp\./, '')));
	return issues
		.filter((i) => {
			const p = /^(?:buildUp\.)?layers\.(\d+)\.bridge\.fraction$/.exec(i.path);
			if (!p) return true;
			const geo = [...paths].some(
				(q) =>
					q.startsWith(`layers.${p[1]}.bridgeGeometry.`) ||
					q === `layers.${p[1]}.bridge.widthMm` ||
					q === `layers.${p[1]}.bridge.centresMm`
			);
			return !geo;
		})
		.map((i) => ({ path: i.path, message: issueText(i.path, i.message) }));
}

/** Up to `max` labelled messages in one line, for a message like "Not saved: …". */
export function issuesSummary(issues: Issue[], max = 3): string {
	const shown = shownIssues(issues);
	if (!shown.length) return 'check the fields marked.';
	const text = shown.slice(0, max).map((i) => `${fieldLabel(i.path)}: ${i.message}`);
	return `${text.join('; ')}${shown.length > max ? `; and ${shown.length - max} more` : ''}.`;
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
