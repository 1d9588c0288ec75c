/**
 * The material library's CSV import and export. The import reads the uploaded stream row by row
 * (csv/read.ts), maps columns by header (or by a mapping the user gave, remembered per header line),
 * validates each row with the library schema, compares it with the current revision of the same code
 * and returns a preview. Committing writes the accepted rows of that preview in one transaction.
 */
import { createHash } from 'node:crypto';
import { db, type Db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import {
	CsvFileError,
	parseNumber,
	readCsvStream,
	DEFAULT_MAX_BYTES,
	type ByteSource,
	type CsvInfo,
	type Delimiter,
	type StreamedFile
} from '$lib/server/csv/read';
import { toCsv, unneutralise, type Cell } from '$lib/server/csv/write';
import {
	diffValues,
	FIELD_COLUMNS,
	FIELD_LABELS,
	LAMBDA_KIND_LABELS,
	LAMBDA_KINDS,
	materialValuesSchema,
	NUMBER_FIELDS,
	REVISION_FIELDS,
	type FieldChange,
	type MaterialValues
} from '$lib/library/schema';
import { MATERIAL_CATEGORIES, MATERIAL_CATEGORY_LABELS } from '$lib/library/categories';
import { plausibilityWarnings } from '$lib/library/ranges';
import {
	currentByCodes,
	currentRevisionStates,
	revisionState,
	insertNewMaterials,
	insertNewRevisions,
	type Actor
} from '$lib/server/library';
import { ConflictError, ValidationError } from '$lib/server/errors';

export const IMPORT_FIELDS = ['code', ...REVISION_FIELDS] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];

/** The column names the export writes and the import reads first. */
export const CSV_COLUMNS: Record<ImportField, string> = FIELD_COLUMNS;

const NUMERIC = new Set<ImportField>(NUMBER_FIELDS);
const REQUIRED: ImportField[] = ['code', 'name', 'category'];

/** A header as a key: lower case, units in brackets dropped, runs of other characters as one '_'. */
export function normaliseHeader(h: string): string {
	return h
		.toLowerCase()
		.replace(/\(.*?\)|\[.*?\]/g, ' ')
		.replace(/[^a-z0-9λμρ]+/g, '_')
		.replace(/^_+|_+$/g, '');
}

const ALIASES = new Map<string, ImportField>();
const alias = (field: ImportField, ...names: string[]) => {
	for (const n of names) ALIASES.set(normaliseHeader(n), field);
};
for (const f of IMPORT_FIELDS) alias(f, CSV_COLUMNS[f], f, FIELD_LABELS[f]);
alias('code', 'material code', 'material_code', 'id', 'ref', 'reference', 'product code');
alias('name', 'material', 'material name', 'description', 'product', 'product name');
alias('manufacturer', 'maker', 'producer', 'brand', 'supplier');
alias('category', 'group', 'material group', 'type');
alias('lambda', 'λ', 'conductivity', 'thermal conductivity', 'lambda w/mk', 'lambda_w_mk');
alias('lambdaKind', 'λ kind', 'lambda type', 'kind of lambda', 'value kind');
alias('resistance', 'r', 'r value', 'r-value', 'thermal resistance');
alias('muDry', 'μ dry', 'mu', 'μ', 'vapour resistance factor', 'mu dry cup', 'μ dry cup');
alias('muWet', 'μ wet', 'mu wet cup', 'μ wet cup');
alias('sd', 'sd value', 'sd-value', 's_d');
alias('density', 'rho', 'ρ');
alias('specificHeat', 'cp', 'c', 'specific heat capacity', 'heat capacity');
alias('thicknessMinMm', 'thickness min', 'min thickness', 'thickness from', 'thickness min mm');
alias('thicknessMaxMm', 'thickness max', 'max thickness', 'thickness to', 'thickness max mm');
alias('source', 'source document', 'reference document');
alias('sourceIssued', 'issued', 'issue date', 'date issued', 'source issue date');
alias('sourceExpires', 'expires', 'expiry', 'expiry date', 'valid until', 'source expiry date');
alias('notes', 'note', 'comments', 'comment', 'remarks');

/** fileHeader → field, or null to ignore that column. */
export type ColumnMapping = Record<string, ImportField | null>;

/** The field a header is mapped to: own keys only (a header named 'constructor' is just a header). */
const fieldOf = (mapping: ColumnMapping, header: string): ImportField | null =>
	Object.hasOwn(mapping, header) ? (mapping[header] ?? null) : null;

export function headerSignature(headers: string[]): string {
	return headers.map(normaliseHeader).join('|');
}

/** The mapping of recognised headers, and which headers were not recognised. */
export function recogniseHeaders(headers: string[]): { mapping: ColumnMapping; unknown: string[] } {
	const mapping: ColumnMapping = {};
	const unknown: string[] = [];
	const used = new Set<ImportField>();
	for (const h of headers) {
		const f = ALIASES.get(normaliseHeader(h));
		if (f && !used.has(f)) {
			mapping[h] = f;
			used.add(f);
		} else {
			mapping[h] = null;
			if (h.trim() !== '') unknown.push(h);
		}
	}
	return { mapping, unknown };
}

/** Problems with a mapping: a field mapped twice, a required field not mapped. */
export function mappingProblems(headers: string[], mapping: ColumnMapping): string[] {
	const problems: string[] = [];
	const seen = new Map<ImportField, string>();
	for (const h of headers) {
		const f = fieldOf(mapping, h);
		if (f === undefined || f === null) continue;
		if (!(IMPORT_FIELDS as readonly string[]).includes(f)) {
			problems.push(`column '${h}' is mapped to '${f}', which is not a library field`);
			continue;
		}
		if (seen.has(f))
			problems.push(`'${CSV_COLUMNS[f]}' is given by two columns: '${seen.get(f)}' and '${h}'`);
		seen.set(f, h);
	}
	const missing = REQUIRED.filter((f) => !seen.has(f)).map((f) => CSV_COLUMNS[f]);
	if (!seen.has('lambda') && !seen.has('resistance')) missing.push('lambda or resistance');
	if (missing.length)
		problems.push(`required ${missing.length === 1 ? 'column' : 'columns'} missing: ${missing.join(', ')}`);
	return problems;
}

/** A problem with one row: `column` names the CSV column at fault, or is '' when the whole row is. */
export type RowIssue = { column: string; message: string };
export type RowStatus = 'new' | 'changed' | 'unchanged' | 'rejected';
export type PreviewRow = {
	line: number;
	code: string;
	name: string;
	category: string;
	status: RowStatus;
	errors: RowIssue[];
	warnings: RowIssue[];
	changes: FieldChange[];
	/**
	 * The values the row was read as, for a new or changed row (λ or R, μ or sd, density, specific heat,
	 * thickness range), so that "0,032" can be seen to have become 0.032.
	 */
	read?: ReadValues;
};
export type ReadValues = Partial<
	Pick<
		MaterialValues,
		| 'lambda'
		| 'resistance'
		| 'muDry'
		| 'sd'
		| 'density'
		| 'specificHeat'
		| 'thicknessMinMm'
		| 'thicknessMaxMm'
	>
>;
const READ_FIELDS = [
	'lambda',
	'resistance',
	'muDry',
	'sd',
	'density',
	'specificHeat',
	'thicknessMinMm',
	'thicknessMaxMm'
] as const;
/** The numbers of a row as read (only those given). */
function readValues(v: MaterialValues): ReadValues {
	const out: Record<string, number> = {};
	for (const f of READ_FIELDS) {
		const x = (v as Record<string, unknown>)[f];
		if (typeof x === 'number') out[f] = x;
	}
	return out as ReadValues;
}
export type ImportCounts = {
	new: number;
	changed: number;
	unchanged: number;
	rejected: number;
	warnings: number;
};

export type ImportPreview = {
	kind: 'preview';
	file: CsvInfo;
	mapping: ColumnMapping;
	mappingSource: 'recognised' | 'saved' | 'given';
	counts: ImportCounts;
	rows: PreviewRow[];
	/** the same file and library state give the same token; commit refuses a different one */
	token: string;
};

export type MappingNeeded = {
	kind: 'mapping';
	message: string;
	headers: string[];
	suggested: ColumnMapping;
	problems: string[];
	fields: { field: ImportField; column: string; label: string; required: boolean }[];
};

export type ImportSummary = {
	added: number;
	changed: number;
	unchanged: number;
	rejected: number;
	mappingSaved: boolean;
};

const CATEGORY_BY_TEXT = new Map<string, string>();
for (const c of MATERIAL_CATEGORIES) {
	CATEGORY_BY_TEXT.set(c, c);
	CATEGORY_BY_TEXT.set(MATERIAL_CATEGORY_LABELS[c].toLowerCase(), c);
}
const KIND_BY_TEXT = new Map<string, string>();
for (const k of LAMBDA_KINDS) {
	KIND_BY_TEXT.set(k, k);
	KIND_BY_TEXT.set(LAMBDA_KIND_LABELS[k].toLowerCase(), k);
}
const YES = new Set(['yes', 'y', 'true', '1', 'x']);
const NO = new Set(['no', 'n', 'false', '0', '']);

type ParsedRow = {
	line: number;
	/** '' when the row's cells cannot be placed under their columns */
	code: string;
	/** the code shown in the preview: for a row that cannot be placed, the one it seems to carry */
	shownCode: string;
	name: string;
	category: string;
	values: MaterialValues | null;
	errors: RowIssue[];
	warnings: RowIssue[];
};

type ColumnKind =
	'number' | 'category' | 'lambdaKind' | 'indicative' | 'date' | 'text' | 'manufacturer' | 'other';
const kindOf = (f: ImportField): ColumnKind =>
	NUMERIC.has(f)
		? 'number'
		: f === 'category'
			? 'category'
			: f === 'lambdaKind'
				? 'lambdaKind'
				: f === 'indicative'
					? 'indicative'
					: f === 'sourceIssued' || f === 'sourceExpires'
						? 'date'
						: f === 'code' || f === 'name'
							? 'text'
							: f === 'manufacturer'
								? 'manufacturer'
								: 'other';

/** How the columns of one file are read: worked out once per file, used for every row. */
type Plan = {
	headers: string[];
	columns: { index: number; field: ImportField; header: string; kind: ColumnKind }[];
	codeAt: number;
	columnName: (field: string) => string;
	delimiter: Delimiter;
	today: string;
};

function planOf(headers: string[], mapping: ColumnMapping, delimiter: Delimiter, today: string): Plan {
	const columns: Plan['columns'] = [];
	const columnOf: Partial<Record<string, string>> = {};
	headers.forEach((h, index) => {
		const field = fieldOf(mapping, h);
		if (!field) return;
		columns.push({ index, field, header: h, kind: kindOf(field) });
		columnOf[field] = h;
	});
	return {
		headers,
		columns,
		codeAt: headers.findIndex((h) => fieldOf(mapping, h) === 'code'),
		columnName: (f) => columnOf[f] ?? CSV_COLUMNS[f as ImportField] ?? f,
		delimiter,
		today
	};
}

/** The empty list every row without issues shares (never written to: lists are replaced, not pushed). */
const NONE: never[] = Object.freeze([]) as unknown as never[];

/** One record → values and per-column issues. */
function readRow(cells: string[], line: number, plan: Plan): ParsedRow {
	if (cells.length !== plan.headers.length) return misplacedRow(cells, line, plan);
	const { raw, errors: cellErrors, failed } = readCells(cells, plan);
	const parsed = materialValuesSchema.safeParse(raw);
	const errors = parsed.success
		? cellErrors
		: [...cellErrors, ...schemaErrors(parsed.error.issues, failed, plan)];
	const values = parsed.success && errors.length === 0 ? parsed.data : null;
	return {
		line,
		code: String(raw.code ?? ''),
		shownCode: String(raw.code ?? ''),
		name: String(raw.name ?? ''),
		category: String(raw.category ?? ''),
		values,
		errors: errors.length === 0 ? NONE : errors,
		warnings: values ? rowWarnings(values, plan) : NONE
	};
}

/**
 * A record whose cells cannot be placed under their columns (more or fewer than the header has): say
 * so and nothing else. The code is named when its cell is there to read (the separator fault may lie
 * after it).
 */
function misplacedRow(cells: string[], line: number, plan: Plan): ParsedRow {
	const columns = plan.headers.length;
	const code =
		plan.codeAt >= 0 && plan.codeAt < cells.length ? unneutralise((cells[plan.codeAt] ?? '').trim()) : '';
	const row = code ? `the row for '${code}'` : 'the row';
	const quotes = cells.length > columns ? ' (text with a separator needs "quotes")' : '';
	const message = `${row} has ${cells.length} ${cells.length === 1 ? 'cell' : 'cells'} but the header has ${columns} columns; check for a missing or extra separator${quotes}`;
	return {
		line,
		code: '',
		shownCode: code,
		name: '',
		category: '',
		values: null,
		errors: [{ column: '', message }],
		warnings: NONE
	};
}

/** One cell read for its field: the value to validate, or why it cannot be read at all. */
type CellReading = { ok: true; value: unknown } | { ok: false; message: string };

/**
 * The mapped cells of a record as raw field values for the schema, the cells that could not be read
 * (in column order) and the fields they belong to.
 */
function readCells(
	cells: string[],
	plan: Plan
): { raw: Record<string, unknown>; errors: RowIssue[]; failed: Set<string> | null } {
	const raw: Record<string, unknown> = {};
	const errors: RowIssue[] = [];
	let failed: Set<string> | null = null;
	for (const { index, field, header, kind } of plan.columns) {
		const read = readCell(kind, unneutralise(cells[index].trim()), plan.delimiter);
		if (read.ok) raw[field] = read.value;
		else {
			errors.push({ column: header, message: read.message });
			(failed ??= new Set()).add(field);
		}
	}
	return { raw, errors, failed };
}

/** One trimmed cell by the kind of its column (numbers with the file's decimal sign, names of categories…). */
function readCell(kind: ColumnKind, cell: string, delimiter: Delimiter): CellReading {
	switch (kind) {
		case 'number': {
			const n = parseNumber(cell, delimiter);
			return n.ok ? { ok: true, value: n.value } : { ok: false, message: n.message };
		}
		case 'category':
			return {
				ok: true,
				value: cell === '' ? undefined : (CATEGORY_BY_TEXT.get(cell.toLowerCase()) ?? cell)
			};
		case 'lambdaKind':
			return { ok: true, value: cell === '' ? null : (KIND_BY_TEXT.get(cell.toLowerCase()) ?? cell) };
		case 'indicative':
			return readYesNo(cell);
		case 'date':
			return { ok: true, value: cell === '' ? null : isoDate(cell) };
		case 'text':
			return { ok: true, value: cell };
		case 'manufacturer':
			return { ok: true, value: cell === '' ? 'generic' : cell };
		default:
			return { ok: true, value: cell === '' ? null : cell };
	}
}

/** yes/no in the words a spreadsheet holds (an empty cell is no). */
function readYesNo(cell: string): CellReading {
	const t = cell.toLowerCase();
	if (YES.has(t)) return { ok: true, value: true };
	if (NO.has(t)) return { ok: true, value: false };
	return { ok: false, message: `'${cell}' is not yes or no` };
}

/** A date written D.M.YYYY as YYYY-MM-DD; anything else as written, for the schema to judge. */
function isoDate(cell: string): string {
	const dmy = /^(\d{1,2})\.(\d{1,2})\.(\d{4})$/.exec(cell);
	return dmy ? `${dmy[3]}-${dmy[2].padStart(2, '0')}-${dmy[1].padStart(2, '0')}` : cell;
}

/**
 * The schema's issues as row issues, leaving out what follows from a cell already refused: the field
 * itself; λ, R and the λ kind when λ or R could not be read; μ dry when μ wet could not.
 */
function schemaErrors(
	issues: { path: PropertyKey[]; message: string }[],
	failed: Set<string> | null,
	plan: Plan
): RowIssue[] {
	const lambdaOrRFailed = failed !== null && (failed.has('lambda') || failed.has('resistance'));
	const errors: RowIssue[] = [];
	for (const iss of issues) {
		const f = String(iss.path[0] ?? '');
		if (failed?.has(f)) continue;
		if (lambdaOrRFailed && (f === 'lambda' || f === 'resistance' || f === 'lambdaKind')) continue;
		if (f === 'muDry' && failed?.has('muWet')) continue;
		errors.push({ column: plan.columnName(f), message: iss.message });
	}
	return errors;
}

/** The plausibility warnings of valid values, each under its CSV column. */
function rowWarnings(values: MaterialValues, plan: Plan): RowIssue[] {
	const found = plausibilityWarnings(values, plan.today);
	return found.length === 0
		? NONE
		: found.map((w) => ({ column: plan.columnName(w.field), message: w.message }));
}

/** What a commit needs of a preview: the rows it writes and the library state it was compared with. */
type CommitPlan = {
	organisationId: string;
	token: string;
	headers: string[];
	mapping: ColumnMapping;
	mappingSource: ImportPreview['mappingSource'];
	counts: ImportCounts;
	rows: number;
	bytes: number;
	added: MaterialValues[];
	revised: { materialId: string; previousRevisionId: string; revision: number; values: MaterialValues }[];
	/** every code the file offers (valid rows) → the state (revision and status) it was compared with, or null */
	compared: Map<string, string | null>;
	at: number;
};

type Analysis = { preview: ImportPreview; plan: CommitPlan };

export type ImportOptions = { mapping?: ColumnMapping | null; maxBytes?: number; today?: string };

function mappingStep(
	message: string,
	headers: string[],
	suggested: ColumnMapping,
	problems: string[]
): MappingNeeded {
	return {
		kind: 'mapping',
		message,
		headers,
		suggested,
		problems,
		fields: IMPORT_FIELDS.map((f) => ({
			field: f,
			column: CSV_COLUMNS[f],
			label: FIELD_LABELS[f],
			required: REQUIRED.includes(f)
		}))
	};
}

type MappingFound = { mapping: ColumnMapping; source: ImportPreview['mappingSource'] };

/** The mapping for a header line: given, saved for that header, or recognised; or the mapping step. */
async function mappingFor(
	k: Db,
	organisationId: string,
	headers: string[],
	given: ColumnMapping | null | undefined
): Promise<MappingFound | { needed: MappingNeeded }> {
	checkHeaderNames(headers);
	if (given) return completeMapping(headers, { mapping: given, source: 'given' });
	const saved = await savedMapping(k, organisationId, headers);
	if (saved) return completeMapping(headers, { mapping: saved, source: 'saved' });
	return recognisedMapping(headers);
}

/** Refuses a header line with a nameless column before a named one (blank columns at the end may stay). */
function checkHeaderNames(headers: string[]): void {
	const blank = headers.findIndex((h) => h === '');
	if (headers.length > 0 && blank >= 0 && headers.slice(blank).some((h) => h !== '')) {
		throw new CsvFileError(
			`Line 1, column ${blank + 1} has no name; give every column a name in the header line.`,
			'header',
			1
		);
	}
}

/**
 * The mapping saved for this header signature, perhaps spelt otherwise ('Code' for 'code', other units
 * in brackets): carried over header by header, by the same normalised key. Null when none is saved.
 */
async function savedMapping(k: Db, organisationId: string, headers: string[]): Promise<ColumnMapping | null> {
	const saved = await k('import_mappings')
		.where({
			organisation_id: organisationId,
			kind: 'materials',
			header_signature: headerSignature(headers)
		})
		.first('mapping');
	if (!saved) return null;
	const byKey = new Map<string, ImportField | null>();
	for (const [h, f] of Object.entries(saved.mapping as ColumnMapping)) byKey.set(normaliseHeader(h), f);
	return Object.fromEntries(headers.map((h) => [h, byKey.get(normaliseHeader(h)) ?? null]));
}

/**
 * The mapping of headers Envelo knows by name. Unknown headers ask for the mapping step; known headers
 * that still do not make a complete mapping refuse the file.
 */
function recognisedMapping(headers: string[]): MappingFound | { needed: MappingNeeded } {
	const rec = recogniseHeaders(headers);
	const problems = mappingProblems(headers, rec.mapping);
	if (rec.unknown.length > 0) {
		const columns = rec.unknown.map((u) => `'${u}'`).join(', ');
		return {
			needed: mappingStep(
				`Envelo does not know ${rec.unknown.length === 1 ? 'the column' : 'these columns'}: ${columns}. Say which library field each column holds (or ignore it); the choice is remembered for files with the same header.`,
				headers,
				rec.mapping,
				problems
			)
		};
	}
	if (problems.length > 0) {
		throw new CsvFileError(
			`Line 1: ${problems.join('; ')}. The header has: ${headers.join(', ')}.`,
			'header',
			1
		);
	}
	return { mapping: rec.mapping, source: 'recognised' };
}

/** A given or saved mapping as it is, or the mapping step when it is not complete. */
function completeMapping(headers: string[], found: MappingFound): MappingFound | { needed: MappingNeeded } {
	const problems = mappingProblems(headers, found.mapping);
	if (problems.length === 0) return found;
	return {
		needed: mappingStep(
			`The column mapping is not complete: ${problems.join('; ')}.`,
			headers,
			found.mapping,
			problems
		)
	};
}

/** Reads, checks and compares a file: the preview to show and the plan its commit writes; or the mapping step. */
async function analyse(
	k: Db,
	organisationId: string,
	source: ByteSource,
	opts: ImportOptions
): Promise<Analysis | MappingNeeded> {
	const read = await readImportFile(k, organisationId, source, opts);
	if ('kind' in read) return read;
	const { file, info, mapping, mappingSource, rows } = read;
	const { headers } = file;
	rejectDuplicateCodes(rows, headers.find((h) => fieldOf(mapping, h) === 'code') ?? 'code');

	const codes: string[] = [];
	for (const r of rows) if (r.values) codes.push(r.code);
	const existing = await currentByCodes(k, organisationId, codes);
	const { counts, previewRows, added, revised, compared } = compareRows(rows, existing);
	const token = tokenOf(organisationId, file.sha256, headers, mapping, existing);
	return {
		preview: { kind: 'preview', file: info, mapping, mappingSource, counts, rows: previewRows, token },
		plan: {
			organisationId,
			token,
			headers,
			mapping,
			mappingSource,
			counts,
			rows: file.rows,
			bytes: file.bytes,
			added,
			revised,
			compared,
			at: Date.now()
		}
	};
}

/** A file read row by row under its mapping, with what the preview says of the file itself. */
type RowsRead = {
	file: StreamedFile;
	info: CsvInfo;
	mapping: ColumnMapping;
	mappingSource: ImportPreview['mappingSource'];
	rows: ParsedRow[];
};

/**
 * Every record of the file read under the mapping its header line gets; or the mapping step. Rows are
 * read even when a mapping is needed, so a broken file says so at once.
 */
async function readImportFile(
	k: Db,
	organisationId: string,
	source: ByteSource,
	opts: ImportOptions
): Promise<RowsRead | MappingNeeded> {
	const today = opts.today ?? new Date().toISOString().slice(0, 10);
	let plan: Plan | null = null;
	let needed: MappingNeeded | null = null;
	let mapping: ColumnMapping = {};
	let mappingSource: ImportPreview['mappingSource'] = 'recognised';
	let decimal: '.' | ',' = '.';
	const rows: ParsedRow[] = [];
	const file = await readCsvStream(
		source,
		{ maxBytes: opts.maxBytes ?? DEFAULT_MAX_BYTES },
		async (headers, delimiter) => {
			const m = await mappingFor(k, organisationId, headers, opts.mapping);
			if ('needed' in m) needed = m.needed;
			else {
				mapping = m.mapping;
				mappingSource = m.source;
				plan = planOf(headers, m.mapping, delimiter, today);
			}
		},
		(cells, line) => {
			if (!plan) return;
			if (plan.delimiter === ';' && decimal === '.' && hasDecimalComma(cells)) decimal = ',';
			rows.push(readRow(cells, line, plan));
		}
	);
	if (needed) return needed;
	const info: CsvInfo = {
		bytes: file.bytes,
		bom: file.bom,
		delimiter: file.delimiter,
		decimal,
		headers: file.headers,
		rows: file.rows
	};
	return { file, info, mapping, mappingSource, rows };
}

/** Whether a record holds a number written with a decimal comma (as the preview reports the file). */
const hasDecimalComma = (cells: string[]) => cells.some((c) => /^\s*[+-]?\d*,\d+\s*$/.test(c));

/**
 * Duplicate codes within the file: all occurrences are rejected, since we cannot know which is right.
 * Each gets the lines of them all under the code column; the rows are changed in place.
 */
function rejectDuplicateCodes(rows: ParsedRow[], codeColumn: string): void {
	const linesByCode = new Map<string, number[]>();
	for (const r of rows) {
		if (!r.code) continue;
		const lines = linesByCode.get(r.code);
		if (lines) lines.push(r.line);
		else linesByCode.set(r.code, [r.line]);
	}
	for (const r of rows) {
		const lines = linesByCode.get(r.code);
		if (r.code && lines && lines.length > 1) {
			r.errors = [
				...r.errors,
				{
					column: codeColumn,
					message: `code '${r.code}' appears on lines ${lines.join(', ')}; keep one of them`
				}
			];
			r.values = null;
			r.warnings = NONE;
		}
	}
}

/** The current revisions of the library for the codes a file offers. */
type CurrentByCode = Awaited<ReturnType<typeof currentByCodes>>;

/** What comparing the rows with the library gives: the preview rows and counts, and what to write. */
type Comparison = {
	counts: ImportCounts;
	previewRows: PreviewRow[];
	added: CommitPlan['added'];
	revised: CommitPlan['revised'];
	compared: CommitPlan['compared'];
};

/** Each row against the current revision of its code: rejected, new, unchanged or changed. */
function compareRows(rows: ParsedRow[], existing: CurrentByCode): Comparison {
	const c: Comparison = {
		counts: { new: 0, changed: 0, unchanged: 0, rejected: 0, warnings: 0 },
		previewRows: [],
		added: [],
		revised: [],
		compared: new Map()
	};
	c.previewRows = rows.map((r) => compareRow(r, existing, c));
	return c;
}

const SUPERSEDED_WARNING: RowIssue = {
	column: '',
	message:
		'the library marks this material superseded (not for new work); importing makes a new, unverified revision current'
};

/** One row's preview; counts it, and notes what its commit writes and the state it was compared with. */
function compareRow(r: ParsedRow, existing: CurrentByCode, c: Comparison): PreviewRow {
	const base = {
		line: r.line,
		code: r.shownCode,
		name: r.name,
		category: r.category,
		errors: r.errors,
		warnings: r.warnings
	};
	if (!r.values) {
		c.counts.rejected++;
		return { ...base, status: 'rejected', warnings: NONE, changes: NONE };
	}
	const cur = existing.get(r.code);
	c.compared.set(r.code, cur ? revisionState(cur.revisionId, cur.status) : null);
	if (!cur) {
		c.counts.new++;
		if (r.warnings.length) c.counts.warnings++;
		c.added.push(r.values);
		return { ...base, status: 'new', changes: NONE, read: readValues(r.values) };
	}
	const changes = diffValues(cur.values, r.values);
	if (changes.length === 0) {
		c.counts.unchanged++;
		return { ...base, status: 'unchanged', warnings: NONE, changes };
	}
	c.counts.changed++;
	const warnings = cur.status === 'superseded' ? [...r.warnings, { ...SUPERSEDED_WARNING }] : r.warnings;
	if (warnings.length) c.counts.warnings++;
	c.revised.push({
		materialId: cur.materialId,
		previousRevisionId: cur.revisionId,
		revision: cur.revision,
		values: r.values
	});
	return { ...base, warnings, status: 'changed', changes, read: readValues(r.values) };
}

/** The same file, mapping and library state give the same token, in any process. */
function tokenOf(
	organisationId: string,
	sha256: string,
	headers: string[],
	mapping: ColumnMapping,
	existing: CurrentByCode
): string {
	const hash = createHash('sha256')
		.update(organisationId)
		.update(sha256)
		.update(JSON.stringify(headers.map((h) => [h, fieldOf(mapping, h)])));
	for (const code of [...existing.keys()].sort()) {
		const e = existing.get(code)!;
		hash.update(`${code}=${revisionState(e.revisionId, e.status)};`);
	}
	return hash.digest('hex');
}

/**
 * Previews kept for their commit, so confirming does not read and check the file a second time. Kept
 * in this process only, for a while and within bounds; a commit that finds none reads the file again
 * (the page sends it with the confirmation), so a restart or a second server only costs time.
 */
const PREVIEW_TTL_MS = 30 * 60 * 1000;
const PREVIEW_MAX = 16;
const PREVIEW_MAX_ROWS = 100_000;
const previews = new Map<string, CommitPlan>();

/** How much a kept plan holds: every code it compared (new, changed and unchanged rows). */
const sizeOf = (p: CommitPlan) => Math.max(p.compared.size, p.added.length + p.revised.length);

function keep(plan: CommitPlan): void {
	const key = `${plan.organisationId}:${plan.token}`;
	previews.delete(key);
	if (sizeOf(plan) > PREVIEW_MAX_ROWS) return; // too big to keep: its commit reads the file again
	previews.set(key, plan);
	let rows = 0;
	for (const p of previews.values()) rows += sizeOf(p);
	// Oldest first: past their time, then as many as the bounds need.
	for (const [k, p] of previews) {
		if (previews.size <= PREVIEW_MAX && rows <= PREVIEW_MAX_ROWS && Date.now() - p.at < PREVIEW_TTL_MS) break;
		previews.delete(k);
		rows -= sizeOf(p);
	}
}

function kept(organisationId: string, token: string): CommitPlan | null {
	const key = `${organisationId}:${token}`;
	const p = previews.get(key);
	if (!p) return null;
	if (Date.now() - p.at >= PREVIEW_TTL_MS) {
		previews.delete(key);
		return null;
	}
	return p;
}

/** For tests: forget every kept preview, as a restart would. */
export function forgetKeptPreviews(): void {
	previews.clear();
}

/** Dry run: the preview of every row (nothing is written), or the mapping step when headers are unknown. */
export async function previewMaterialsImport(
	k: Db,
	organisationId: string,
	source: ByteSource,
	opts: ImportOptions = {}
): Promise<ImportPreview | MappingNeeded> {
	const a = await analyse(k, organisationId, source, opts);
	if ('kind' in a) return a;
	keep(a.plan);
	return a.preview;
}

const CHANGED_SINCE_PREVIEW =
	'The file or the library changed since the preview; preview the file again before you confirm.';

export type { CommitPlan };

type ImportLog = (
	entry: {
		organisationId: string;
		userId: string;
		action: string;
		entity: string;
		entityId: string | null;
		details: Record<string, unknown>;
	},
	trx: Db
) => Promise<void>;

/**
 * What a commit will write: the preview kept for this token, or else the same file read again (and it
 * must give the same token). Reads the file outside any transaction, so a slow upload holds no lock.
 */
export async function planCommit(
	k: Db,
	organisationId: string,
	source: ByteSource | null,
	opts: ImportOptions & { token: string }
): Promise<CommitPlan> {
	const plan = kept(organisationId, opts.token);
	if (plan) return plan;
	if (!source) {
		throw new ConflictError(
			'The preview is no longer kept on the server; send the file again with the confirmation, or preview it again.'
		);
	}
	const a = await analyse(k, organisationId, source, opts);
	if ('kind' in a) throw new ValidationError([], a.message);
	if (a.plan.token !== opts.token) throw new ConflictError(CHANGED_SINCE_PREVIEW);
	return a.plan;
}

const RACED_CONSTRAINTS = new Set([
	'materials_organisation_id_code_unique',
	'material_revisions_material_id_revision_unique'
]);

/**
 * Write a commit plan in one transaction: the library must still be as the preview saw it (the same
 * current revision for every code, checked with the materials to be revised locked), then every new
 * material and new revision goes in; rejected rows are left out. A mapping the user gave is remembered
 * for the next file with the same header.
 */
export async function applyCommit(
	k: Db,
	actor: Actor,
	plan: CommitPlan,
	opts: { confirmWarnings?: boolean; fileName?: string },
	log?: ImportLog
): Promise<ImportSummary> {
	if (plan.organisationId !== actor.organisationId) throw new ConflictError(CHANGED_SINCE_PREVIEW);
	checkWarningsConfirmed(plan.counts, opts.confirmWarnings);
	let summary: ImportSummary;
	try {
		summary = await k.transaction((trx) => writeCommit(trx, actor, plan, opts.fileName, log));
	} catch (e) {
		// A material of the same code created meanwhile (outside any import) lands here.
		if (isRacedInsert(e)) throw new ConflictError(CHANGED_SINCE_PREVIEW);
		throw e;
	}
	previews.delete(`${plan.organisationId}:${plan.token}`);
	return summary;
}

/** Rows with warnings are written only once the person has confirmed them (422 until then). */
function checkWarningsConfirmed(counts: ImportCounts, confirmWarnings: boolean | undefined): void {
	if (counts.warnings > 0 && !confirmWarnings) {
		throw new ValidationError(
			[],
			`${counts.warnings} ${counts.warnings === 1 ? 'row has' : 'rows have'} warnings; confirm them to import.`,
			{},
			422
		);
	}
}

/** Whether an error is a unique violation of a material code or revision written meanwhile. */
function isRacedInsert(e: unknown): boolean {
	const pg = e as { code?: string; constraint?: string };
	return pg.code === '23505' && !!pg.constraint && RACED_CONSTRAINTS.has(pg.constraint);
}

/** The commit inside its transaction: lock, check the library is as previewed, write, remember, log. */
async function writeCommit(
	trx: Db,
	actor: Actor,
	plan: CommitPlan,
	fileName: string | undefined,
	log: ImportLog | undefined
): Promise<ImportSummary> {
	await lockForCommit(trx, actor, plan);
	await checkUnchangedSincePreview(trx, actor, plan);
	await insertNewMaterials(trx, actor, plan.added);
	await insertNewRevisions(trx, actor, plan.revised);
	const mappingSaved = await saveGivenMapping(trx, actor, plan);
	const done: ImportSummary = {
		added: plan.added.length,
		changed: plan.revised.length,
		unchanged: plan.counts.unchanged,
		rejected: plan.counts.rejected,
		mappingSaved
	};
	if (log) {
		await log(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action: 'import',
				entity: 'material',
				entityId: null,
				details: { ...done, file: fileName ?? null, bytes: plan.bytes, rows: plan.rows }
			},
			trx
		);
	}
	return done;
}

/**
 * One import at a time per organisation; the materials about to be revised are locked, so an edit of
 * one of them waits for this commit (and then finds it).
 */
async function lockForCommit(trx: Db, actor: Actor, plan: CommitPlan): Promise<void> {
	await trx.raw('SELECT pg_advisory_xact_lock(hashtext(?))', [`materials-import:${actor.organisationId}`]);
	if (plan.revised.length > 0) {
		await trx.raw('SELECT id FROM materials WHERE organisation_id = ? AND id = ANY(?::uuid[]) FOR UPDATE', [
			actor.organisationId,
			plan.revised.map((r) => r.materialId)
		]);
	}
}

/** Refuses the commit when any code the preview compared now has another current revision or status. */
async function checkUnchangedSincePreview(trx: Db, actor: Actor, plan: CommitPlan): Promise<void> {
	const now = await currentRevisionStates(trx, actor.organisationId, [...plan.compared.keys()]);
	for (const [code, state] of plan.compared) {
		if ((now.get(code) ?? null) !== state) throw new ConflictError(CHANGED_SINCE_PREVIEW);
	}
}

/** Remembers a mapping the person gave for files with the same header, when the commit used the file. */
async function saveGivenMapping(trx: Db, actor: Actor, plan: CommitPlan): Promise<boolean> {
	const used = plan.added.length > 0 || plan.revised.length > 0 || plan.counts.unchanged > 0;
	if (plan.mappingSource !== 'given' || !used) return false;
	await trx('import_mappings')
		.insert({
			organisation_id: actor.organisationId,
			kind: 'materials',
			header_signature: headerSignature(plan.headers),
			mapping: JSON.stringify(plan.mapping)
		})
		.onConflict(['organisation_id', 'kind', 'header_signature'])
		.merge({ mapping: JSON.stringify(plan.mapping), updated_at: trx.fn.now() });
	return true;
}

/** Commit in one call: `planCommit` then `applyCommit`. `source` may be null when the preview is kept. */
export async function commitMaterialsImport(
	k: Db,
	actor: Actor,
	source: ByteSource | null,
	opts: ImportOptions & { token: string; confirmWarnings?: boolean; fileName?: string },
	log?: ImportLog
): Promise<ImportSummary> {
	const plan = await planCommit(k, actor.organisationId, source, opts);
	return applyCommit(k, actor, plan, opts, log);
}

/** Export the current revision of every material, in the columns the import reads. */
export function materialsToCsv(items: MaterialValues[]): string {
	const headers = IMPORT_FIELDS.map((f) => CSV_COLUMNS[f]);
	function* rows(): Generator<Cell[]> {
		for (const v of items)
			yield IMPORT_FIELDS.map((f) =>
				f === 'indicative'
					? v.indicative
						? 'yes'
						: 'no'
					: // no manufacturer is kept as 'generic' and written as the blank it was typed as (read back the same)
						f === 'manufacturer' && v.manufacturer === 'generic'
						? ''
						: ((v as Record<string, unknown>)[f] as Cell)
			);
	}
	return toCsv(headers, rows());
}

/** The import against the app's database, with the activity log: what the upload route calls. */
export const libraryImport = {
	preview: (organisationId: string, source: ByteSource, opts: { mapping?: ColumnMapping | null }) =>
		previewMaterialsImport(db, organisationId, source, opts),
	plan: (
		organisationId: string,
		source: ByteSource | null,
		opts: { mapping?: ColumnMapping | null; token: string }
	) => planCommit(db, organisationId, source, opts),
	commit: (actor: Actor, plan: CommitPlan, opts: { confirmWarnings?: boolean; fileName?: string }) =>
		applyCommit(db, actor, plan, opts, (entry, trx) => logActivity(entry, trx))
};
