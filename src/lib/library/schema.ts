/**
 * The material library's shared vocabulary and validation: used by the page, the JSON API, the CSV
 * import and the seed alike. Pure TypeScript (relative imports only, so the benchmark can load it).
 */
import { z } from 'zod';
import {
	MATERIAL_CATEGORIES,
	MATERIAL_CATEGORY_LABELS,
	type MaterialCategory
} from '$lib/library/categories';
import { fieldIssues, isoDate, pageQuery, type FieldIssue } from '$lib/validation';

/** How a λ value was arrived at (the distinction ISO 10456 draws between declared and design values). */
export const LAMBDA_KINDS = ['declared', 'design', 'table'] as const;
export type LambdaKind = (typeof LAMBDA_KINDS)[number];
export const LAMBDA_KIND_LABELS: Record<LambdaKind, string> = {
	declared: 'Declared by the manufacturer',
	design: 'Design value',
	table: 'Generic table value'
};

export const MATERIAL_STATUSES = ['unverified', 'verified', 'superseded'] as const;
export type MaterialStatus = (typeof MATERIAL_STATUSES)[number];
export const MATERIAL_STATUS_LABELS: Record<MaterialStatus, string> = {
	unverified: 'Unverified',
	verified: 'Verified',
	superseded: 'Superseded'
};

/** Characters that make a spreadsheet treat a cell as a formula (OWASP "CSV Injection", common practice). */
export const FORMULA_START = /^[=+\-@\t\r]/;

const describe = (v: unknown) =>
	typeof v === 'string' ? `'${v.length > 24 ? v.slice(0, 24) + '…' : v}'` : String(v);

const number = (what = 'a number') =>
	z.number({
		error: (iss) =>
			iss.input === undefined || iss.input === null ? 'is required' : `${describe(iss.input)} is not ${what}`
	});

/** Control characters other than tab and line breaks: PostgreSQL refuses a zero byte in text. */
const CONTROL_CHARACTER = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

/** Free text that a spreadsheet will not run as a formula. */
const safeText = (max: number) =>
	z
		.string({ error: 'must be text' })
		.trim()
		.max(max, `must be at most ${max} characters`)
		.refine((s) => !FORMULA_START.test(s), {
			message: 'begins with =, +, - or @ and would run as a spreadsheet formula; remove that first character'
		})
		.refine((s) => !CONTROL_CHARACTER.test(s), {
			message: 'holds an invisible control character (such as a zero byte); remove it'
		});

const optionalNumber = (schema: z.ZodNumber) => schema.nullable().optional();

/** A vapour resistance factor μ (dry or wet cup); still air is 1 (ISO 10456:2007 §3). */
const vapourResistanceFactor = () =>
	optionalNumber(
		number().gte(1, 'must be at least 1 (still air has μ = 1)').lte(1e7, 'must be at most 10 000 000')
	);

/**
 * The values of one revision of a material. Limits here are physical (λ > 0, μ ≥ 1, …); what is merely
 * unusual for a category is a warning from `plausibilityWarnings`, which a person must confirm.
 */
export const materialValuesObject = z.object({
	code: z
		.string({ error: 'must be text' })
		.trim()
		// one message for the first thing wrong: an empty code is not also "must start with a letter"
		.min(1, { message: 'is required', abort: true })
		.max(64, { message: 'must be at most 64 characters', abort: true })
		.regex(
			/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/,
			'may hold letters, digits, . _ - / and must start with a letter or digit'
		),
	name: safeText(200).pipe(z.string().min(1, 'is required')),
	manufacturer: safeText(200).optional().default('generic'),
	category: z.enum(MATERIAL_CATEGORIES, {
		error: `must be one of: ${MATERIAL_CATEGORIES.join(', ')}`
	}),
	/** W/(m·K) */
	lambda: optionalNumber(
		number().gt(0, 'must be greater than 0 W/(m·K)').lte(1000, 'must be at most 1000 W/(m·K)')
	),
	lambdaKind: z
		.enum(LAMBDA_KINDS, { error: `must be one of: ${LAMBDA_KINDS.join(', ')}` })
		.nullable()
		.optional(),
	/** m²·K/W, a fixed thermal resistance instead of λ */
	resistance: optionalNumber(
		number().gte(0, 'must be 0 or more m²·K/W').lte(100, 'must be at most 100 m²·K/W')
	),
	/** vapour resistance factor, dry cup */
	muDry: vapourResistanceFactor(),
	/** vapour resistance factor, wet cup */
	muWet: vapourResistanceFactor(),
	/** m, a fixed vapour diffusion-equivalent air layer thickness instead of μ */
	sd: optionalNumber(number().gte(0, 'must be 0 or more m').lte(100000, 'must be at most 100 000 m')),
	/** kg/m³ */
	density: optionalNumber(
		number().gt(0, 'must be greater than 0 kg/m³').lte(25000, 'must be at most 25 000 kg/m³')
	),
	/** J/(kg·K) */
	specificHeat: optionalNumber(
		number().gt(0, 'must be greater than 0 J/(kg·K)').lte(10000, 'must be at most 10 000 J/(kg·K)')
	),
	thicknessMinMm: optionalNumber(
		number().gte(0, 'must be 0 mm or more').lte(10000, 'must be at most 10 000 mm')
	),
	thicknessMaxMm: optionalNumber(
		number().gt(0, 'must be greater than 0 mm').lte(10000, 'must be at most 10 000 mm')
	),
	source: safeText(300).nullable().optional(),
	sourceIssued: isoDate.nullable().optional(),
	sourceExpires: isoDate.nullable().optional(),
	indicative: z.boolean({ error: 'must be yes or no' }).optional().default(false),
	notes: safeText(2000).nullable().optional()
});

export const materialValuesSchema = materialValuesObject.superRefine((m, ctx) => {
	const issue = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
	const has = (v: unknown) => v !== null && v !== undefined;
	if (!has(m.lambda) && !has(m.resistance)) issue('lambda', 'give λ or a fixed thermal resistance');
	if (has(m.lambda) && has(m.resistance))
		issue('resistance', 'give either λ or a fixed thermal resistance, not both');
	if (has(m.lambda) && !has(m.lambdaKind)) issue('lambdaKind', 'say whether λ is declared, design or table');
	// With neither λ nor R the missing value is the one fault to report; a kind of λ beside a fixed R is a
	// separate one.
	if (!has(m.lambda) && has(m.resistance) && has(m.lambdaKind))
		issue('lambdaKind', 'applies only when λ is given');
	if (has(m.sd) && (has(m.muDry) || has(m.muWet))) issue('sd', 'give either μ or an sd-value, not both');
	if (has(m.muWet) && !has(m.muDry)) issue('muDry', 'is required when μ wet is given');
	if (has(m.thicknessMinMm) && has(m.thicknessMaxMm) && m.thicknessMaxMm! < m.thicknessMinMm!) {
		issue('thicknessMaxMm', 'thickness range max below min');
	}
	if (has(m.sourceIssued) && has(m.sourceExpires) && m.sourceExpires! < m.sourceIssued!) {
		issue('sourceExpires', 'expires before it was issued');
	}
	if (m.category === 'air-layers' && has(m.lambda)) {
		issue('lambda', 'air layers take a fixed thermal resistance (ISO 6946 tables), not λ');
	}
});

export type MaterialValuesInput = z.input<typeof materialValuesSchema>;
export type MaterialValues = z.output<typeof materialValuesSchema>;

/** The fields a revision carries (everything but the code), in the order they are shown and exported. */
export const REVISION_FIELDS = [
	'name',
	'manufacturer',
	'category',
	'lambda',
	'lambdaKind',
	'resistance',
	'muDry',
	'muWet',
	'sd',
	'density',
	'specificHeat',
	'thicknessMinMm',
	'thicknessMaxMm',
	'source',
	'sourceIssued',
	'sourceExpires',
	'indicative',
	'notes'
] as const;
export type RevisionField = (typeof REVISION_FIELDS)[number];

/** Fields that feed a calculation; a change to one of them matters to existing work. */
export const PHYSICAL_FIELDS = [
	'lambda',
	'resistance',
	'muDry',
	'muWet',
	'sd',
	'density',
	'specificHeat'
] as const;

/** Fields that hold a number (the form and the CSV import read them as numbers, with a point or a comma). */
export const NUMBER_FIELDS = [...PHYSICAL_FIELDS, 'thicknessMinMm', 'thicknessMaxMm'] as const;

/**
 * The snake_case name of every field: the database column of a revision, and the CSV column the
 * export writes and the import reads first (so an export imports back unchanged).
 */
export const FIELD_COLUMNS: Record<'code' | RevisionField, string> = {
	code: 'code',
	name: 'name',
	manufacturer: 'manufacturer',
	category: 'category',
	lambda: 'lambda',
	lambdaKind: 'lambda_kind',
	resistance: 'resistance',
	muDry: 'mu_dry',
	muWet: 'mu_wet',
	sd: 'sd',
	density: 'density',
	specificHeat: 'specific_heat',
	thicknessMinMm: 'thickness_min_mm',
	thicknessMaxMm: 'thickness_max_mm',
	source: 'source',
	sourceIssued: 'source_issued',
	sourceExpires: 'source_expires',
	indicative: 'indicative',
	notes: 'notes'
};

export const FIELD_LABELS: Record<'code' | RevisionField, string> = {
	code: 'Code',
	name: 'Name',
	manufacturer: 'Manufacturer',
	category: 'Category',
	lambda: 'λ W/(m·K)',
	lambdaKind: 'Kind of λ',
	resistance: 'R m²·K/W',
	muDry: 'μ dry',
	muWet: 'μ wet',
	sd: 'sd m',
	density: 'Density kg/m³',
	specificHeat: 'Specific heat J/(kg·K)',
	thicknessMinMm: 'Thickness from mm',
	thicknessMaxMm: 'Thickness to mm',
	source: 'Source',
	sourceIssued: 'Source issued',
	sourceExpires: 'Source expires',
	indicative: 'Indicative',
	notes: 'Notes'
};

export type FieldChange = { field: RevisionField; from: unknown; to: unknown };

/** Normalise a value for comparison: '' and undefined are null; text trimmed. */
function norm(v: unknown): unknown {
	if (v === undefined || v === '') return null;
	if (typeof v === 'string') return v.trim() === '' ? null : v.trim();
	return v;
}

/** What differs between two sets of revision values, field by field (values compared exactly). */
export function diffValues(
	from: Partial<Record<RevisionField, unknown>>,
	to: Partial<Record<RevisionField, unknown>>
): FieldChange[] {
	const out: FieldChange[] = [];
	for (const f of REVISION_FIELDS) {
		let a = norm(from[f]);
		let b = norm(to[f]);
		if (f === 'manufacturer') {
			a ??= 'generic';
			b ??= 'generic';
		}
		if (f === 'indicative') {
			a = Boolean(a);
			b = Boolean(b);
		}
		if (a !== b) out.push({ field: f, from: a, to: b });
	}
	return out;
}

/** A row of the library list, as GET /api/v1/materials returns it. */
export type MaterialSummary = {
	id: string;
	code: string;
	revisionId: string;
	revision: number;
	name: string;
	manufacturer: string;
	category: MaterialCategory;
	lambda: number | null;
	lambdaKind: LambdaKind | null;
	resistance: number | null;
	muDry: number | null;
	muWet: number | null;
	sd: number | null;
	density: number | null;
	specificHeat: number | null;
	thicknessMinMm: number | null;
	thicknessMaxMm: number | null;
	source: string | null;
	status: MaterialStatus;
};

/** One revision in full. */
export type MaterialRevision = MaterialSummary & {
	sourceIssued: string | null;
	sourceExpires: string | null;
	indicative: boolean;
	notes: string | null;
	verifiedBy: { id: string; name: string | null; email: string } | null;
	verifiedAt: string | null;
	createdBy: { id: string; name: string | null; email: string } | null;
	createdAt: string;
};

export const SORTS = [
	'code',
	'-code',
	'name',
	'-name',
	'category',
	'-category',
	'lambda',
	'-lambda',
	'updated',
	'-updated'
] as const;

/** Query of the list: the same filters for the page and GET /api/v1/materials. */
export const listQuerySchema = z.object({
	q: z.string().trim().max(100, 'must be at most 100 characters').optional().default(''),
	category: z
		.enum(MATERIAL_CATEGORIES, { error: `must be one of: ${MATERIAL_CATEGORIES.join(', ')}` })
		.optional(),
	status: z.enum(MATERIAL_STATUSES, { error: `must be one of: ${MATERIAL_STATUSES.join(', ')}` }).optional(),
	...pageQuery(50, 200),
	sort: z
		.enum(SORTS, { error: `must be one of: ${SORTS.join(', ')}` })
		.optional()
		.default('code')
});
export type ListQuery = z.output<typeof listQuerySchema>;

/** A library value at fault: `field` names it as the form and the CSV columns do (the same as `path`). */
export type MaterialIssue = FieldIssue & { field: string };

/** Issues of a failed zod parse of material values, with the field named by its path. */
export function materialIssues(error: z.ZodError): MaterialIssue[] {
	return fieldIssues(error, '(row)').map((i) => ({ ...i, field: i.path }));
}

/** A warning (or issue) of the library's own `{ field, message }` shape as a field issue. */
export const asMaterialIssue = (w: { field: string; message: string }): MaterialIssue => ({
	path: w.field,
	...w
});
