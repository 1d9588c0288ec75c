/**
 * Form schemas of the audit pages (flat, as a browser posts them) and the small pure functions that turn
 * a posted form into the audit's input, checked with the same schemas the JSON API uses (`./schemas`).
 */
import { z } from 'zod';
import { formNumber } from '$lib/forms';
import { decisionSchema, newBatchSchema, resubmitSchema, type DecisionInput, type NewBatch } from './schemas';

/** One problem of a form, under the form's own field name (or '' for the form as a whole). */
export type FormIssue = { field: string; message: string };

/** A domain schema's issues under the form's field names; an issue no field takes goes to the form ('' ). */
function issuesOf(error: z.ZodError, fieldOf: (path: string) => string | undefined): FormIssue[] {
	return error.issues.map((i) => ({
		field: fieldOf(i.path.map(String).join('.')) ?? '',
		message: i.message
	}));
}

/* ------------------------------------------------------------------ a new batch */

/** The statuses a new batch starts from (the form's first showing). */
export const DEFAULT_BATCH_STATUSES = ['issued', 'awaiting-review', 'accepted', 'returned'];

export const newBatchFormSchema = z.object({
	name: z.string().default(''),
	source: z.enum(['filter', 'references']).default('filter'),
	programme: z.string().default(''),
	assessorId: z.string().default(''),
	issuedFrom: z.string().default(''),
	issuedTo: z.string().default(''),
	/** the ticked statuses; none ticked is every status */
	statuses: z.array(z.string()).default([]),
	/** dwelling references typed or pasted, one per line (or a CSV with a "reference" column) */
	references: z.string().default(''),
	/** the same as an uploaded CSV file (read instead of the text when given) */
	file: z.instanceof(File).optional(),
	rule: z.enum(['all', 'random']).default('random'),
	percent: z.string().default(''),
	minimumPerAssessor: z.string().default(''),
	seed: z.string().default(''),
	/** a check box: not posted when unticked, so false by default (the form's first showing ticks it) */
	includeFlagged: z.boolean().default(false)
});
export type NewBatchForm = z.infer<typeof newBatchFormSchema>;

/** The form's first showing: a list of references (and a name) handed over by another page, or none. */
export function newBatchFormDefaults(prefill: { references: string[]; name: string }): NewBatchForm {
	// a list handed over by another page (a material's reach) is audited whole unless changed
	const handedOver = prefill.references.length > 0;
	return {
		name: prefill.name,
		source: handedOver ? 'references' : 'filter',
		programme: '',
		assessorId: '',
		issuedFrom: '',
		issuedTo: '',
		statuses: [...DEFAULT_BATCH_STATUSES],
		references: prefill.references.join('\n'),
		file: undefined,
		rule: handedOver ? 'all' : 'random',
		percent: '10',
		minimumPerAssessor: '1',
		seed: '',
		includeFlagged: true
	};
}

const blankToUndefined = (s: string) => (s.trim() === '' ? undefined : s.trim());

/**
 * The form as a new batch's input, before its check: blank fields left out, numbers as typed (a decimal
 * comma allowed), the references as read from the text or the file (`references`). A count before the
 * batch is named (`forPreview`) takes any name.
 */
export function newBatchInputFromForm(
	f: Omit<NewBatchForm, 'file'>,
	references: string[] | undefined,
	forPreview = false
) {
	const includeFlagged = f.includeFlagged;
	return {
		name: blankToUndefined(f.name) ?? (forPreview ? 'preview' : ''),
		source: f.source,
		filter: {
			assessorId: blankToUndefined(f.assessorId),
			issuedFrom: blankToUndefined(f.issuedFrom),
			issuedTo: blankToUndefined(f.issuedTo),
			statuses: f.statuses.length ? f.statuses : undefined,
			programme: blankToUndefined(f.programme)
		},
		references: f.source === 'references' ? references : undefined,
		sampling:
			f.rule === 'random'
				? {
						rule: f.rule,
						percent: formNumber(f.percent),
						minimumPerAssessor: formNumber(f.minimumPerAssessor) ?? 0,
						includeFlagged
					}
				: { rule: f.rule, includeFlagged },
		seed: blankToUndefined(f.seed)
	};
}

/** A path of the new batch's input (or of the service's refusal) as the form's field. */
export function batchFieldOf(path: string): string | undefined {
	const [head, sub] = path.split('.');
	switch (head) {
		case 'name':
		case 'seed':
		case 'source':
		case 'file':
			return head;
		case 'references':
			return 'references';
		case 'filter':
			// a refusal of the filter as a whole ("no dwellings match") is said beside the statuses
			return sub === undefined || sub === 'statuses' ? 'statuses' : sub;
		case 'sampling':
			return sub === undefined || sub === 'rule' ? 'rule' : sub;
		default:
			return undefined;
	}
}

/** The posted form checked as a new batch: its input, or each problem under its field. */
export function checkNewBatch(
	f: Omit<NewBatchForm, 'file'>,
	references: string[] | undefined,
	forPreview = false
): { ok: true; input: NewBatch } | { ok: false; issues: FormIssue[] } {
	const parsed = newBatchSchema.safeParse(newBatchInputFromForm(f, references, forPreview));
	return parsed.success
		? { ok: true, input: parsed.data }
		: { ok: false, issues: issuesOf(parsed.error, batchFieldOf) };
}

/** "Recompute again": a button; the batch is the page's. */
export const batchRefreshFormSchema = z.object({});

/* ------------------------------------------------------------------ a decision on an item */

export const decisionFormSchema = z.object({
	decision: z.string().default(''),
	comment: z.string().default('')
});
export type DecisionForm = z.infer<typeof decisionFormSchema>;

/** The decision form checked as the API's decision: its input, or each problem under its field. */
export function checkDecision(
	f: DecisionForm
): { ok: true; input: DecisionInput } | { ok: false; issues: FormIssue[] } {
	const parsed = decisionSchema.safeParse({ decision: f.decision, comment: f.comment });
	return parsed.success
		? { ok: true, input: parsed.data }
		: {
				ok: false,
				issues: issuesOf(parsed.error, (p) => (p === 'decision' || p === 'comment' ? p : undefined))
			};
}

/* ------------------------------------------------------------------ a resubmission */

/** One returned item's form; each item's form has its own id (`resubmitFormId`). */
export const resubmitFormSchema = z.object({
	itemId: z.uuid({ error: 'No such audit item.' }),
	comment: z.string().default('')
});
export type ResubmitForm = z.infer<typeof resubmitFormSchema>;

export const resubmitFormId = (itemId: string) => `resubmit-${itemId}`;

/** The resubmission's comment checked as the API's: its input, or the problem beside the comment. */
export function checkResubmit(
	f: Pick<ResubmitForm, 'comment'>
): { ok: true; input: z.output<typeof resubmitSchema> } | { ok: false; issues: FormIssue[] } {
	const parsed = resubmitSchema.safeParse({ comment: f.comment });
	return parsed.success
		? { ok: true, input: parsed.data }
		: { ok: false, issues: issuesOf(parsed.error, (p) => (p === 'comment' ? p : undefined)) };
}
