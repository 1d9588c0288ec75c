/**
 * `parseJunctionInput`: the zod schema (./junction-schema), then the geometry as a whole
 * (./junction-geometry), then the node cap: the coarsest mesh that follows every edge, halved
 * once (the least the refinement check needs), must fit in JUNCTION_NODES_MAX nodes.
 */
import type { z } from 'zod';
import type { FieldIssue } from './schema';
import { countIssues, junctionInputSchema, type JunctionInput } from './junction-schema';
import { buildBlocks, geometryIssues, type BlockModel } from './junction-geometry';
import { buildMesh, coarseDivisions, gridPointsAt } from './junction-mesh';
import { JUNCTION_NODES_MAX } from './junction-bounds';

/** Thrown by `analyseJunction` for invalid input; `issues` name each field, `message` lists them. */
export class JunctionInputError extends Error {
	readonly issues: FieldIssue[];
	constructor(issues: FieldIssue[]) {
		super(issues.map((i) => i.message).join('; '));
		this.name = 'JunctionInputError';
		this.issues = issues;
	}
}

const FIELD: Record<string, string> = {
	lambda: 'λ',
	uValue: 'U-value',
	lengthMm: 'length',
	rs: 'Rs',
	temperature: 'temperature',
	environment: 'environment',
	name: 'name'
};

const nameOf = (raw: unknown, key: string, i: number): string => {
	const item = (raw as Record<string, unknown[]> | null)?.[key]?.[i] as { name?: unknown } | undefined;
	return typeof item?.name === 'string' && item.name.length > 0 && item.name.length <= 60
		? ` (“${item.name}”)`
		: '';
};

/** "Region 2 (“insulation”): λ", "Boundary 3: from", "Environment “outside”: Rs" … for a path. */
export function labelOf(path: readonly PropertyKey[], raw: unknown): string {
	const [head, second, ...rest] = path.map(String);
	const coordinate = (p: string) => (p === '0' ? 'x' : p === '1' ? 'y' : p);
	const field = (parts: string[]) =>
		parts
			.map((p, k) => (k === 0 ? (head === 'probes' ? coordinate(p) : (FIELD[p] ?? p)) : ` ${coordinate(p)}`))
			.join('');
	const tail = (parts: string[]) => (parts.length ? `: ${field(parts)}` : '');
	const item: Record<string, string> = {
		regions: 'Region',
		boundaries: 'Boundary',
		flanks: 'Flank',
		probes: 'Probe'
	};
	if (head in item && second !== undefined) {
		const i = Number(second);
		const label = `${item[head]} ${i + 1}${head === 'probes' || head === 'boundaries' ? '' : nameOf(raw, head, i)}`;
		return label + tail(rest);
	}
	if (head === 'environments' && second !== undefined) return `Environment “${second}”${tail(rest)}`;
	const top: Record<string, string> = {
		regions: 'Regions',
		boundaries: 'Boundaries',
		environments: 'Environments',
		flanks: 'Flanks',
		probes: 'Probes'
	};
	return head === undefined ? 'Input' : (top[head] ?? head);
}

function schemaIssues(issues: readonly z.core.$ZodIssue[], raw: unknown): FieldIssue[] {
	return issues.map((i) => ({
		path: i.path.map(String).join('.') || '(input)',
		message: `${labelOf(i.path, raw)} ${i.message}`
	}));
}

/** The node cap, checked on the coarsest mesh halved once (the refinement needs at least that). */
function nodeCapIssues(input: JunctionInput, b: BlockModel): FieldIssue[] {
	const div = coarseDivisions(b, input.maxCellMm);
	if (buildMesh(b, div, 1)) return [];
	const points = gridPointsAt(div, 1);
	const where = input.maxCellMm === undefined ? 'regions' : 'maxCellMm';
	const remedy = input.maxCellMm === undefined ? 'use fewer distinct coordinates' : 'give a larger maxCellMm';
	return [
		{
			path: where,
			message: `The mesh check needs more than the ${JUNCTION_NODES_MAX} nodes allowed (the coarsest mesh that follows every edge, halved once, has ${points} grid points): ${remedy}`
		}
	];
}

export type ParsedJunction =
	{ ok: true; data: JunctionInput; blocks: BlockModel } | { ok: false; issues: FieldIssue[] };

/**
 * Validate a raw junction input without throwing: field-named issues, or the data (zod's copy, with
 * unknown keys dropped) and its block model.
 */
export function parseJunctionInput(raw: unknown): ParsedJunction {
	const counts = countIssues(raw);
	if (counts.length) return { ok: false, issues: schemaIssues(counts as unknown as z.core.$ZodIssue[], raw) };
	const r = junctionInputSchema.safeParse(raw);
	if (!r.success) return { ok: false, issues: schemaIssues(r.error.issues, raw) };
	const built = buildBlocks(r.data);
	if ('issues' in built) return { ok: false, issues: built.issues };
	const issues = geometryIssues(r.data, built.model);
	if (issues.length === 0) issues.push(...nodeCapIssues(r.data, built.model));
	return issues.length ? { ok: false, issues } : { ok: true, data: r.data, blocks: built.model };
}
