/**
 * Input of the two-dimensional junction calculation (ISO 10211): its zod schema, and
 * `parseJunctionInput`, which applies the schema and then the checks that need the geometry as a
 * whole (every boundary on the edge of the material, no piece of material without a boundary,
 * probes inside the material, meshes within the node cap: ./junction-geometry).
 *
 * Every issue has a dotted path (`regions.1.lambda`, zero-based like every path of the engine) and
 * a message that names the item as a person counts it, from one: "Region 2: λ must be greater
 * than 0".
 */
import { z } from 'zod';
import type { FieldIssue } from './schema';
import {
	JUNCTION_BOUNDARIES_MAX,
	JUNCTION_CELL_MIN_MM,
	JUNCTION_COORD_MAX_MM,
	JUNCTION_ENVIRONMENTS_MAX,
	JUNCTION_FLANK_LENGTH_MAX_MM,
	JUNCTION_FLANKS_MAX,
	JUNCTION_LAMBDA_MAX,
	JUNCTION_LAMBDA_MIN,
	JUNCTION_NAME_MAX,
	JUNCTION_PROBES_MAX,
	JUNCTION_REGIONS_MAX,
	JUNCTION_RS_MAX,
	JUNCTION_TEMPERATURE_MAX,
	JUNCTION_TEMPERATURE_MIN,
	JUNCTION_U_MAX
} from './junction-bounds';

const describe = (v: unknown): string => {
	if (typeof v === 'number') return String(v);
	if (v === null) return 'null';
	if (typeof v === 'string') return `the text "${v.length > 20 ? v.slice(0, 20) + '…' : v}"`;
	return Array.isArray(v) ? 'a list' : typeof v;
};

const num = () =>
	z.number({
		error: (iss) =>
			iss.input === undefined ? 'must be given' : `must be a finite number, got ${describe(iss.input)}`
	});
const text = () =>
	z.string({ error: (iss) => (iss.input === undefined ? 'must be given' : 'must be a text') });
const list = <T extends z.ZodType>(item: T) =>
	z.array(item, {
		error: (iss) => (iss.input === undefined ? 'must be given' : `must be a list, got ${describe(iss.input)}`)
	});
const point = () => z.tuple([num(), num()], { error: () => 'must be a point [x, y] of two numbers (mm)' });

const regionSchema = z.object({
	name: text().optional(),
	x0: num(),
	y0: num(),
	x1: num(),
	y1: num(),
	lambda: num()
});
const boundarySchema = z.object({ from: point(), to: point(), environment: text() });
const environmentSchema = z.object({ temperature: num(), rs: num() });
const flankSchema = z.object({ name: text().optional(), uValue: num(), lengthMm: num() });

const shape = z.object(
	{
		regions: list(regionSchema),
		boundaries: list(boundarySchema),
		environments: z.record(text(), environmentSchema, {
			error: (iss) =>
				iss.input === undefined ? 'must be given' : 'must be an object of environments by name'
		}),
		flanks: list(flankSchema).optional(),
		probes: list(point()).optional(),
		maxCellMm: num().optional()
	},
	{ error: () => 'must be an object with regions, boundaries and environments' }
);

export type JunctionRegion = z.infer<typeof regionSchema>;
export type JunctionBoundary = z.infer<typeof boundarySchema>;
export type JunctionEnvironment = z.infer<typeof environmentSchema>;
export type JunctionFlank = z.infer<typeof flankSchema>;
export type JunctionInput = z.infer<typeof shape>;

type Add = (path: (string | number)[], message: string) => void;
type Check = readonly [(v: number) => boolean, string];

const COORD: Check[] = [
	[(v) => Math.abs(v) <= JUNCTION_COORD_MAX_MM, `must lie within ±${JUNCTION_COORD_MAX_MM} mm (±20 m)`]
];

function checkNumber(
	v: number | undefined,
	checks: readonly Check[],
	path: (string | number)[],
	add: Add
): void {
	if (v === undefined) return;
	for (const [ok, message] of checks) {
		if (!ok(v)) return add(path, message);
	}
}

const checkName = (name: string | undefined, path: (string | number)[], add: Add): void => {
	if (name !== undefined && name.length > JUNCTION_NAME_MAX)
		add(path, `must be at most ${JUNCTION_NAME_MAX} characters, got ${name.length}`);
};

function checkRegions(regions: JunctionRegion[], add: Add): void {
	regions.forEach((r, i) => {
		for (const k of ['x0', 'y0', 'x1', 'y1'] as const) checkNumber(r[k], COORD, ['regions', i, k], add);
		if (r.x1 - r.x0 < 0.001) add(['regions', i, 'x1'], 'must be at least 0.001 mm greater than x0');
		if (r.y1 - r.y0 < 0.001) add(['regions', i, 'y1'], 'must be at least 0.001 mm greater than y0');
		checkNumber(
			r.lambda,
			[
				[(v) => v > 0, 'must be greater than 0'],
				[(v) => v >= JUNCTION_LAMBDA_MIN, `must be at least ${JUNCTION_LAMBDA_MIN} W/(m·K)`],
				[(v) => v <= JUNCTION_LAMBDA_MAX, `must be at most ${JUNCTION_LAMBDA_MAX} W/(m·K)`]
			],
			['regions', i, 'lambda'],
			add
		);
		checkName(r.name, ['regions', i, 'name'], add);
	});
}

function checkBoundaries(input: JunctionInput, add: Add): void {
	input.boundaries.forEach((b, i) => {
		b.from.forEach((v, k) => checkNumber(v, COORD, ['boundaries', i, 'from', k], add));
		b.to.forEach((v, k) => checkNumber(v, COORD, ['boundaries', i, 'to', k], add));
		if (!Object.hasOwn(input.environments, b.environment))
			add(['boundaries', i, 'environment'], `names "${b.environment}", which is not among the environments`);
		const dx = Math.abs(b.to[0] - b.from[0]);
		const dy = Math.abs(b.to[1] - b.from[1]);
		if (dx >= 0.001 && dy >= 0.001)
			add(['boundaries', i], 'must be horizontal or vertical (the edges of rectangular regions are)');
		else if (dx < 0.001 && dy < 0.001)
			add(['boundaries', i], 'has no length (from and to are the same point)');
	});
}

function checkEnvironments(input: JunctionInput, add: Add): void {
	const names = Object.keys(input.environments);
	if (names.length > JUNCTION_ENVIRONMENTS_MAX)
		add(['environments'], `must number at most ${JUNCTION_ENVIRONMENTS_MAX}, got ${names.length}`);
	for (const name of names) {
		const e = input.environments[name];
		checkName(name, ['environments', name], add);
		checkNumber(
			e.temperature,
			[
				[(v) => v >= JUNCTION_TEMPERATURE_MIN, `must be at least ${JUNCTION_TEMPERATURE_MIN} °C`],
				[(v) => v <= JUNCTION_TEMPERATURE_MAX, `must be at most ${JUNCTION_TEMPERATURE_MAX} °C`]
			],
			['environments', name, 'temperature'],
			add
		);
		checkNumber(
			e.rs,
			[
				[(v) => v >= 0, 'must be 0 or more (0 fixes the surface temperature)'],
				[(v) => v <= JUNCTION_RS_MAX, `must be at most ${JUNCTION_RS_MAX} m²·K/W`]
			],
			['environments', name, 'rs'],
			add
		);
	}
	const used = new Set(input.boundaries.map((b) => b.environment));
	if (![...used].every((n) => Object.hasOwn(input.environments, n))) return; // named per boundary
	const temperatures = new Set([...used].map((n) => input.environments[n].temperature));
	if (used.size > 0 && temperatures.size < 2)
		add(
			['environments'],
			'must include two of different temperatures among those the boundaries face (a coupling coefficient needs a temperature difference)'
		);
}

function checkExtras(input: JunctionInput, add: Add): void {
	(input.flanks ?? []).forEach((f, i) => {
		checkNumber(
			f.uValue,
			[
				[(v) => v >= 0, 'must be 0 or more'],
				[(v) => v <= JUNCTION_U_MAX, `must be at most ${JUNCTION_U_MAX} W/(m²·K)`]
			],
			['flanks', i, 'uValue'],
			add
		);
		checkNumber(
			f.lengthMm,
			[
				[(v) => v > 0, 'must be greater than 0'],
				[(v) => v <= JUNCTION_FLANK_LENGTH_MAX_MM, `must be at most ${JUNCTION_FLANK_LENGTH_MAX_MM} mm`]
			],
			['flanks', i, 'lengthMm'],
			add
		);
		checkName(f.name, ['flanks', i, 'name'], add);
	});
	(input.probes ?? []).forEach((p, i) => p.forEach((v, k) => checkNumber(v, COORD, ['probes', i, k], add)));
	checkNumber(
		input.maxCellMm,
		[
			[(v) => v >= JUNCTION_CELL_MIN_MM, `must be at least ${JUNCTION_CELL_MIN_MM} mm`],
			[(v) => v <= 2 * JUNCTION_COORD_MAX_MM, `must be at most ${2 * JUNCTION_COORD_MAX_MM} mm`]
		],
		['maxCellMm'],
		add
	);
}

const COUNTS: readonly (readonly [keyof JunctionInput, number, number])[] = [
	['regions', JUNCTION_REGIONS_MAX, 1],
	['boundaries', JUNCTION_BOUNDARIES_MAX, 1],
	['flanks', JUNCTION_FLANKS_MAX, 0],
	['probes', JUNCTION_PROBES_MAX, 0]
];

/** Too many or too few items in a list, checked before zod parses the items one by one. */
export function countIssues(raw: unknown): { path: string[]; message: string }[] {
	if (typeof raw !== 'object' || raw === null) return [];
	const out: { path: string[]; message: string }[] = [];
	for (const [key, max, min] of COUNTS) {
		const v = (raw as Record<string, unknown>)[key];
		if (!Array.isArray(v)) continue;
		if (v.length > max) out.push({ path: [key], message: `must have at most ${max} items, got ${v.length}` });
		else if (v.length < min) out.push({ path: [key], message: `must have at least ${min} item` });
	}
	return out;
}

/**
 * The junction input: types, ranges, and the rules between fields that need no geometry (an
 * environment named by a boundary exists, two different temperatures are faced, boundaries are
 * horizontal or vertical). Ranges and bounds: ./junction-bounds.
 */
export const junctionInputSchema = shape.superRefine((input, ctx) => {
	const add: Add = (path, message) => ctx.addIssue({ code: 'custom', path, message });
	for (const c of countIssues(input)) add(c.path, c.message);
	checkRegions(input.regions, add);
	checkBoundaries(input, add);
	checkEnvironments(input, add);
	checkExtras(input, add);
});

export type { FieldIssue };
