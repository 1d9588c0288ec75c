import { error, redirect } from '@sveltejs/kit';
import { message, setError, withFiles, type SuperValidated } from 'sveltekit-superforms';
import { requireRole } from '$lib/server/guard';
import { createBatch, listAssessors, listProgrammes, previewBatch } from '$lib/server/audit';
import { enqueueRecompute } from '$lib/server/audit/worker';
import { parseReferenceFile, parseReferenceText, type ReferenceLine } from '$lib/server/audit/references';
import {
	batchFieldOf,
	checkNewBatch,
	newBatchFormDefaults,
	newBatchFormSchema,
	type FormIssue,
	type NewBatchForm
} from '$lib/audit/forms';
import { DWELLING_STATUSES } from '$lib/dwellings/kinds';
import { formFor, readForm } from '$lib/server/forms';
import { NotFoundError, refusalOf } from '$lib/server/errors';

/** What the form says above its fields: a sentence, and the reference lines that could not be used. */
export type BatchFormMessage = { text: string; lines: string[] };
type BatchForm = SuperValidated<NewBatchForm, BatchFormMessage>;

export async function load(event) {
	const member = requireRole(event, 'supervisor', 'admin');
	const [assessors, programmes] = await Promise.all([
		listAssessors(member.organisationId),
		listProgrammes(member.organisationId)
	]);
	return {
		assessors,
		programmes,
		statuses: DWELLING_STATUSES,
		batchForm: await formFor(
			newBatchFormSchema,
			newBatchFormDefaults({ references: prefilledReferences(event.url), name: prefilledName(event.url) })
		)
	};
}

/**
 * `?references=` (one per line): dwelling references to start a batch "from a list of references" with,
 * as a link from another page (a material's reach) gives them. At most 5,000; checked like any typed
 * list when the batch is created (a reference may hold a comma, so only line breaks separate them).
 */
function prefilledReferences(url: URL): string[] {
	const raw = url.searchParams.get('references') ?? '';
	const refs = raw
		.split(/[\r\n]+/)
		.map((r) => r.trim())
		.filter((r) => r.length > 0 && r.length <= 200);
	return [...new Set(refs)].slice(0, 5000);
}

/** `?name=`: the batch name the linking page suggests (checked like a typed one on creation). */
function prefilledName(url: URL): string {
	return (url.searchParams.get('name') ?? '').trim().slice(0, 200);
}

/** The form's answer when it cannot be used: each problem beside its field, the sentence and lines above. */
function refused(form: BatchForm, status: number, text: string, issues: FormIssue[], lines: string[] = []) {
	for (const i of issues) {
		if (i.field === 'statuses') setError(form, 'statuses._errors' as never, i.message);
		else if (i.field) setError(form, i.field as never, i.message);
	}
	const unplaced = issues.filter((i) => !i.field).map((i) => i.message);
	return message(form, { text, lines: [...lines, ...unplaced] }, { status: status as 400 });
}

/** The posted form as a new batch's input (with the reference lines read), or the answer saying why not. */
async function readBatch(form: BatchForm, forPreview: boolean) {
	let referenceLines: ReferenceLine[] | undefined;
	const { file, ...fields } = form.data;
	if (fields.source === 'references') {
		const parsed =
			file && file.size > 0
				? parseReferenceFile(new Uint8Array(await file.arrayBuffer()))
				: parseReferenceText(fields.references);
		if (parsed.issues.length)
			return {
				failure: refused(
					form,
					400,
					'The reference list could not be used; nothing was created.',
					[],
					parsed.issues.map((i) => i.message)
				)
			} as const;
		referenceLines = parsed.lines;
	}
	const checked = checkNewBatch(
		fields,
		referenceLines?.map((l) => l.reference),
		forPreview
	);
	if (!checked.ok)
		return { failure: refused(form, 400, 'Check the marked fields.', checked.issues) } as const;
	return { input: { ...checked.input, referenceLines, references: undefined } } as const;
}

/** A service's refusal as the form's answer: its fields marked, its reference lines listed. */
function refusedByService(form: BatchForm, e: unknown, text = (m: string) => m) {
	const refusal = refusalOf(e);
	if (!refusal) throw e;
	if (refusal instanceof NotFoundError) error(404, refusal.message);
	const placed = refusal.issues.filter((i) => i.line === undefined);
	return refused(
		form,
		refusal.status,
		text(refusal.message),
		placed.map((i) => ({ field: batchFieldOf(i.path) ?? '', message: i.message })).filter((i) => i.field),
		refusal.issues.filter((i) => i.line !== undefined).map((i) => i.message)
	);
}

export const actions = {
	/** What the batch would hold, before it is created: the matching dwellings and the sample's size. */
	preview: async (event) => {
		const member = requireRole(event, 'supervisor', 'admin');
		const form = await readForm(event.request, newBatchFormSchema);
		if (!form.valid) return refused(form, 400, 'Check the marked fields.', []);
		const read = await readBatch(form, true);
		if ('failure' in read) return read.failure;
		try {
			const preview = await previewBatch(member, read.input);
			return withFiles({ batchForm: form, preview });
		} catch (e) {
			// nothing is created by a count, so the refusal need not say so
			return refusedByService(form, e, (m) => m.replace('; nothing was created.', '.'));
		}
	},

	create: async (event) => {
		const member = requireRole(event, 'supervisor', 'admin');
		const form = await readForm(event.request, newBatchFormSchema);
		if (!form.valid) return refused(form, 400, 'Check the marked fields.', []);
		const read = await readBatch(form, false);
		if ('failure' in read) return read.failure;
		let id: string;
		try {
			({ id } = await createBatch(member, read.input));
		} catch (e) {
			return refusedByService(form, e);
		}
		await enqueueRecompute(member.organisationId, id, member.user.id);
		redirect(303, `/audit/${id}`);
	}
};
