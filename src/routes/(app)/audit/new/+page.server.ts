import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { createBatch, listAssessors, listProgrammes, previewBatch } from '$lib/server/audit';
import { enqueueRecompute } from '$lib/server/audit/worker';
import { parseReferenceFile, parseReferenceText, type ReferenceLine } from '$lib/server/audit/references';
import { newBatchSchema } from '$lib/audit/schemas';
import { DWELLING_STATUSES } from '$lib/dwellings/kinds';
import { AppError } from '$lib/server/errors';

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
		prefill: prefilledReferences(event.url),
		prefillName: prefilledName(event.url)
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

const text = (f: FormData, k: string) => {
	const v = f.get(k);
	return typeof v === 'string' && v.trim() !== '' ? v.trim() : undefined;
};
const number = (f: FormData, k: string) => {
	const v = text(f, k);
	return v === undefined ? undefined : Number(v.replace(',', '.'));
};

/** An expected refusal as the form's answer: field messages beside their fields, reference lines listed. */
function refused(e: AppError, values: Record<string, string>, statuses: string[]) {
	const errors: Record<string, string> = {};
	for (const i of e.issues) if (i.line === undefined) errors[i.path] ??= i.message;
	return fail(e.status, {
		values,
		statuses,
		message: e.message,
		errors,
		lines: e.issues.filter((i) => i.line !== undefined).map((i) => i.message)
	});
}

/** The form as a new batch's input, or the answer that says what is wrong with it. */
async function readBatchForm(f: FormData, forPreview: boolean) {
	const values = Object.fromEntries([...f.entries()].filter(([, v]) => typeof v === 'string')) as Record<
		string,
		string
	>;
	const statuses = f.getAll('statuses').filter((s): s is string => typeof s === 'string');
	const source = text(f, 'source') === 'references' ? 'references' : 'filter';
	let referenceLines: ReferenceLine[] | undefined;
	if (source === 'references') {
		const file = f.get('file');
		const parsed =
			file instanceof File && file.size > 0
				? parseReferenceFile(new Uint8Array(await file.arrayBuffer()))
				: parseReferenceText(text(f, 'references') ?? '');
		if (parsed.issues.length) {
			return {
				failure: fail(400, {
					values,
					statuses,
					message: 'The reference list could not be used; nothing was created.',
					errors: {},
					lines: parsed.issues.map((i) => i.message)
				})
			} as const;
		}
		referenceLines = parsed.lines;
	}
	const rule = text(f, 'rule') === 'random' ? 'random' : 'all';
	const raw = {
		// a count before the batch is named: any name will do
		name: text(f, 'name') ?? (forPreview ? 'preview' : ''),
		source,
		filter: {
			assessorId: text(f, 'assessorId'),
			issuedFrom: text(f, 'issuedFrom'),
			issuedTo: text(f, 'issuedTo'),
			statuses: statuses.length ? statuses : undefined,
			programme: text(f, 'programme')
		},
		references: referenceLines?.map((l) => l.reference),
		sampling:
			rule === 'random'
				? {
						rule,
						percent: number(f, 'percent'),
						minimumPerAssessor: number(f, 'minimumPerAssessor') ?? 0,
						includeFlagged: f.get('includeFlagged') === 'on'
					}
				: { rule, includeFlagged: f.get('includeFlagged') === 'on' },
		seed: text(f, 'seed')
	};
	const parsed = newBatchSchema.safeParse(raw);
	if (!parsed.success) {
		const errors: Record<string, string> = {};
		for (const i of parsed.error.issues) errors[i.path.map(String).join('.')] ??= i.message;
		return {
			failure: fail(400, { values, statuses, message: 'Check the marked fields.', errors, lines: [] })
		} as const;
	}
	return { values, statuses, referenceLines, input: parsed.data } as const;
}

export const actions = {
	/** What the batch would hold, before it is created: the matching dwellings and the sample's size. */
	preview: async (event) => {
		const member = requireRole(event, 'supervisor', 'admin');
		const form = await readBatchForm(await event.request.formData(), true);
		if ('failure' in form) return form.failure;
		const { values, statuses, referenceLines, input } = form;
		try {
			const preview = await previewBatch(member, { ...input, referenceLines, references: undefined });
			return { values, statuses, preview };
		} catch (e) {
			if (e instanceof AppError) {
				// nothing is created by a count, so the refusal need not say so
				e.message = e.message.replace('; nothing was created.', '.');
				return refused(e, values, statuses);
			}
			throw e;
		}
	},

	create: async (event) => {
		const member = requireRole(event, 'supervisor', 'admin');
		const form = await readBatchForm(await event.request.formData(), false);
		if ('failure' in form) return form.failure;
		const { values, statuses, referenceLines, input: data } = form;
		let id: string;
		try {
			const created = await createBatch(member, { ...data, referenceLines, references: undefined });
			id = created.id;
		} catch (e) {
			if (e instanceof AppError) return refused(e, values, statuses);
			throw e;
		}
		await enqueueRecompute(member.organisationId, id, member.user.id);
		redirect(303, `/audit/${id}`);
	}
};
