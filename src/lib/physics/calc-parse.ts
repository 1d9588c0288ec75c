/**
 * Validation shared by the stand-alone calculations (dynamic characteristics, windows and doors,
 * floors on the ground beyond the slab, unheated spaces): numbers with plain messages, range rules
 * applied in one pass, and issues whose message names the field as a person reads it ("Layer 2
 * (“brick”): density ρ must be greater than 0 kg/m³, got -5"), with the dotted path beside it
 * (`layers.1.density`, zero-based like every path of the engine).
 */
import { z } from 'zod';
import type { FieldIssue } from './schema';

/** A value as a message quotes it. */
export const describeValue = (v: unknown): string => {
	if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
	if (v === null) return 'null';
	if (typeof v === 'string') return `the text "${v.length > 20 ? v.slice(0, 20) + '…' : v}"`;
	return Array.isArray(v) ? 'a list' : typeof v;
};

/** A finite number; ranges are checked by {@link checkFields}. */
export const num = () =>
	z.number({
		error: (iss) =>
			iss.input === undefined ? 'must be given' : `must be a finite number, got ${describeValue(iss.input)}`
	});

/** A short text (a name). */
export const text = () =>
	z
		.string({ error: (iss) => (iss.input === undefined ? 'must be given' : 'must be a text') })
		.max(200, { error: 'must be at most 200 characters' });

/** One of `values`, with a message that lists them. */
export const oneOf = <const T extends readonly [string, ...string[]]>(values: T) =>
	z.enum(values, {
		error: (iss) =>
			iss.input === undefined
				? 'must be given'
				: `must be one of ${values.map((v) => `"${v}"`).join(', ')}, got ${describeValue(iss.input)}`
	});

/** A list with a length check and a plain message. */
export const listOf = <T extends z.ZodType>(item: T, min: number, max: number) =>
	z
		.array(item, {
			error: (iss) =>
				iss.input === undefined ? 'must be given' : `must be a list, got ${describeValue(iss.input)}`
		})
		.min(min, { error: `must have at least ${min} item${min === 1 ? '' : 's'}` })
		.max(max, { error: `must have at most ${max} items` });

/**
 * A range rule: the test, the message when it fails ("must be greater than 0 m") and an optional
 * hint that follows the value ("a value in kJ/(kg·K) must be multiplied by 1000").
 */
export type Rule = readonly [(v: number) => boolean, string, string?];
export type Path = readonly (string | number)[];
export type Add = (path: Path, message: string) => void;

export const positive = (unit = ''): Rule => [
	(v) => v > 0,
	`must be greater than 0${unit ? ' ' + unit : ''}`
];
export const nonNegative = (unit = ''): Rule => [(v) => v >= 0, `must be 0${unit ? ' ' + unit : ''} or more`];
export const atLeast = (min: number, text: string, hint?: string): Rule => [
	(v) => v >= min,
	`must be at least ${text}`,
	hint
];
export const atMost = (max: number, text: string, hint?: string): Rule => [
	(v) => v <= max,
	`must be at most ${text}`,
	hint
];

/**
 * Apply `rules` to the numeric fields of `obj` (fields of the wrong type are zod's issues; absent
 * optional fields are skipped): at most one issue per field, the first rule it fails, with the value.
 */
export function checkFields(
	obj: unknown,
	rules: Readonly<Record<string, readonly Rule[]>>,
	path: Path,
	add: Add
): void {
	if (typeof obj !== 'object' || obj === null) return;
	for (const field of Object.keys(rules)) {
		const v = (obj as Record<string, unknown>)[field];
		if (typeof v !== 'number' || !Number.isFinite(v)) continue;
		const failed = rules[field].find(([ok]) => !ok(v));
		if (failed) add([...path, field], `${failed[1]}, got ${v}${failed[2] ? `: ${failed[2]}` : ''}`);
	}
}

/** A finite number above zero (a field that passed its own checks). */
export const isPositive = (v: unknown): v is number => typeof v === 'number' && v > 0 && v < Infinity;

/** A finite number (a field that passed its own type check). */
export const isFiniteNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/** How to name a path: the lists (by item, counted from one) and the fields of a calculation. */
export interface Labels {
	/** list key → item word, e.g. `layers` → `Layer` */
	lists: Readonly<Record<string, string>>;
	/** field key → how a person reads it, e.g. `density` → `density ρ` */
	fields: Readonly<Record<string, string>>;
}

const itemName = (raw: unknown, list: string, i: number): string => {
	const items = (raw as Record<string, unknown> | null)?.[list];
	const item = Array.isArray(items) ? (items[i] as { name?: unknown } | undefined) : undefined;
	const name = item?.name;
	return typeof name === 'string' && name.length > 0 && name.length <= 60 ? ` (“${name}”)` : '';
};

/** "Layer 2 (“brick”): density ρ", "Period T", "Input" for a path of `raw`. */
export function labelOf(path: Path, raw: unknown, labels: Labels): string {
	if (path.length === 0) return 'Input';
	const [head, second, ...rest] = path.map(String);
	const field = (key: string | undefined) => (key === undefined ? '' : (labels.fields[key] ?? key));
	if (head in labels.lists && second !== undefined && /^\d+$/.test(second)) {
		const label = `${labels.lists[head]} ${Number(second) + 1}${itemName(raw, head, Number(second))}`;
		return rest.length ? `${label}: ${rest.map(field).join(' ')}` : label;
	}
	const plain = [head, second, ...rest]
		.filter((p) => p !== undefined)
		.map(field)
		.join(' ');
	return plain.charAt(0).toUpperCase() + plain.slice(1);
}

/** The outcome of a parse: the data (zod's copy, defaults filled in), or every issue. */
export type Parsed<T> = { ok: true; data: T } | { ok: false; issues: FieldIssue[] };

/**
 * Parse `raw` with `schema` (types and ranges in one pass), then `after` on the typed data for
 * rules that need the whole input. Each message starts with the field's label.
 */
export function parseCalculation<T>(
	schema: z.ZodType<T>,
	raw: unknown,
	labels: Labels,
	after?: (data: T, add: Add) => void
): Parsed<T> {
	const issue = (path: Path, message: string): FieldIssue => ({
		path: path.map(String).join('.') || '(input)',
		message: `${labelOf(path, raw, labels)} ${message}`
	});
	const r = schema.safeParse(raw);
	if (!r.success) return { ok: false, issues: r.error.issues.map((i) => issue(i.path as Path, i.message)) };
	const issues: FieldIssue[] = [];
	after?.(r.data, (path, message) => issues.push(issue(path, message)));
	return issues.length ? { ok: false, issues } : { ok: true, data: r.data };
}

/** Thrown by a stand-alone calculation for invalid input; `issues` name each field. */
export class CalculationInputError extends Error {
	readonly issues: FieldIssue[];
	constructor(issues: FieldIssue[]) {
		super(issues.map((i) => i.message).join('; '));
		this.name = 'CalculationInputError';
		this.issues = issues;
	}
}

/** The data of a parse, or a {@link CalculationInputError} naming every bad field. */
export function assertParsed<T>(parsed: Parsed<T>): T {
	if (!parsed.ok) throw new CalculationInputError(parsed.issues);
	return parsed.data;
}

/** The shape every range refinement of these schemas takes: run even when a type error is present. */
export const ALWAYS = { when: () => true } as const;

/** A refinement's issue sink as an {@link Add}. */
export const addTo =
	(ctx: z.RefinementCtx): Add =>
	(path, message) =>
		ctx.addIssue({ code: 'custom', path: [...path], message });

/** Throws when a result holds a number that is not finite: the bounds should make that impossible. */
export function assertFinite(value: unknown, where: string): void {
	const walk = (v: unknown, path: string): void => {
		if (typeof v === 'number' && !Number.isFinite(v))
			throw new Error(`internal error: ${where} gave a non-finite number at ${path || '(result)'}`);
		if (typeof v === 'object' && v !== null)
			for (const [k, x] of Object.entries(v)) walk(x, path ? `${path}.${k}` : k);
	};
	walk(value, '');
}
