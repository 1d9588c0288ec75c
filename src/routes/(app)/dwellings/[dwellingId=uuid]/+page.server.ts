import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate, setError, message } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	copyDwelling,
	getDwellingPage,
	getReturnNote,
	reopenDwelling,
	setDwellingArchived,
	updateDwelling,
	WRITE_ROLES
} from '$lib/server/dwellings';
import {
	deleteElement,
	duplicateElement,
	listElementSummaries,
	reorderElements
} from '$lib/server/dwellings/elements';
import {
	copyFormSchema,
	dwellingFieldsFromForm,
	dwellingFormSchema,
	floorAreaText
} from '$lib/dwellings/forms';
import { readIssueChanges } from '$lib/server/reports/changes';
import { listJunctions } from '$lib/server/junctions';
import { readDwellingHeatCapacity } from '$lib/server/dwellings/heat-capacity';
import { evidencePanel } from '$lib/server/evidence';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '$lib/server/errors';
import { reopenRefusalText } from '$lib/dwellings/rules';

export const load = async (event) => {
	const member = requireMember(event);
	// The dwelling, its elements (U and checks from their stored results), limit table, climate and the
	// form's options, in one query.
	const page = await getDwellingPage(member.organisationId, event.params.dwellingId);
	if (!page) error(404, 'No such dwelling.');
	const { options, ...overview } = page;
	const d = overview.dwelling;
	const [returned, changes, junctions, evidence, form] = await Promise.all([
		d.status === 'returned' ? getReturnNote(member.organisationId, d.id) : null,
		// Only a dwelling marked as changed (a count above 0) has a list to work out: every write that can
		// change what was issued refreshes or raises the mark (reports/changes.ts, reports/marks.ts).
		d.issueChanges ? readIssueChanges(member.organisationId, d.id, d.issueChanges) : null,
		listJunctions(member.organisationId, d.id),
		evidencePanel(member, d.id),
		superValidate(zod4(dwellingFormSchema), {
			defaults: {
				reference: d.reference,
				address: d.address,
				programme: d.programme ?? '',
				clientName: d.clientName ?? '',
				clientEmail: d.clientEmail ?? '',
				assessorId: d.assessorId ?? '',
				stage: d.stage,
				limitTableId: d.limitTableId ?? '',
				climateId: d.climateId ?? '',
				floorArea: floorAreaText(d.floorArea),
				version: d.version
			}
		})
	]);
	// Streamed after the page: it reads every element's build-up, which the overview leaves out.
	const heatCapacity = readDwellingHeatCapacity(member.organisationId, d.id, d.floorArea);
	return { ...overview, options, returned, changes, junctions, evidence, form, heatCapacity };
};

async function expected<T>(fn: () => Promise<T>) {
	try {
		return { ok: true as const, value: await fn() };
	} catch (e) {
		if (e instanceof ValidationError)
			return {
				ok: false as const,
				status: 400,
				message: e.issues.map((i) => `${i.path}: ${i.message}`).join('; ')
			};
		if (e instanceof ConflictError) return { ok: false as const, status: 409, message: e.message };
		if (e instanceof NotFoundError) error(404, 'Not found.');
		throw e;
	}
}

export const actions = {
	/** Reopen an accepted dwelling, or one awaiting review, for changes, with a reason. */
	reopen: async function reopen(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const data = await event.request.formData();
		try {
			await reopenDwelling(member, event.params.dwellingId, {
				reason: String(data.get('reason') ?? ''),
				version: Number(data.get('version'))
			});
		} catch (e) {
			if (e instanceof AppError && e.status < 500)
				return fail(e.status, { reopenError: reopenRefusalText(e.message, e.issues) });
			throw e;
		}
		return { done: 'Reopened: the reason is logged, and the supervisor sees it with every change.' };
	},
	update: async function update(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await superValidate(event.request, zod4(dwellingFormSchema));
		if (!form.valid) return fail(400, { form });
		const { version, ...fields } = form.data;
		try {
			await updateDwelling(member, event.params.dwellingId, { ...dwellingFieldsFromForm(fields), version });
		} catch (e) {
			if (e instanceof ValidationError) {
				for (const i of e.issues) setError(form, i.path as 'reference', i.message);
				return fail(400, { form });
			}
			if (e instanceof ConflictError) return message(form, e.message, { status: 409 });
			// A change of assessor the rule does not allow: said beside the assessor's field.
			if (e instanceof ForbiddenError) return setError(form, 'assessorId', e.message, { status: 403 });
			if (e instanceof NotFoundError) error(404, 'Not found.');
			throw e;
		}
		return message(form, 'Saved.');
	},
	copy: async function copy(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const body = Object.fromEntries(await event.request.formData());
		const parsed = copyFormSchema.safeParse(body);
		if (!parsed.success) return fail(400, { copyError: parsed.error.issues.map((i) => i.message).join(' ') });
		const { kind, ...copy } = parsed.data;
		const r = await expected(() =>
			copyDwelling(member, event.params.dwellingId, { ...copy, asBuilt: kind === 'as-built' })
		);
		if (!r.ok) return fail(r.status, { copyError: r.message });
		redirect(303, `/dwellings/${r.value.id}`);
	},
	archive: async function archive(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const data = await event.request.formData();
		const r = await expected(() =>
			setDwellingArchived(
				member,
				event.params.dwellingId,
				data.get('archived') === 'true',
				Number(data.get('version'))
			)
		);
		if (!r.ok) return fail(r.status, { actionError: r.message });
		return { done: data.get('archived') === 'true' ? 'Archived.' : 'Restored to draft.' };
	},
	duplicateElement: async function duplicate(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const data = await event.request.formData();
		const r = await expected(() => duplicateElement(member, String(data.get('elementId'))));
		if (!r.ok) return fail(r.status, { actionError: r.message });
		return { done: `Added “${r.value.name}”.` };
	},
	/** Move one element a place up or down (a reorder of the whole list, checked against the dwelling's version). */
	moveElement: async function move(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const data = await event.request.formData();
		const id = String(data.get('elementId') ?? '');
		const direction = data.get('direction');
		if (direction !== 'up' && direction !== 'down')
			return fail(400, { actionError: 'direction: must be up or down.' });
		const elements = await listElementSummaries(member.organisationId, event.params.dwellingId);
		const ids = elements.map((e) => e.id);
		const from = ids.indexOf(id);
		if (from < 0) return fail(400, { actionError: 'elementId: is not an element of this dwelling.' });
		const to = direction === 'up' ? from - 1 : from + 1;
		if (to < 0 || to >= ids.length)
			return fail(400, { actionError: `This element is already ${direction === 'up' ? 'first' : 'last'}.` });
		[ids[from], ids[to]] = [ids[to], ids[from]];
		const r = await expected(() =>
			reorderElements(member, event.params.dwellingId, { ids, version: Number(data.get('version')) })
		);
		if (!r.ok) return fail(r.status, { actionError: r.message });
		return {
			done: `Moved “${elements[from].name}” ${direction} to place ${to + 1} of ${ids.length}.`,
			moved: { id, direction, version: r.value.version }
		};
	},
	deleteElement: async function remove(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const data = await event.request.formData();
		const r = await expected(() =>
			deleteElement(member, String(data.get('elementId')), Number(data.get('version')))
		);
		if (!r.ok) return fail(r.status, { actionError: r.message });
		return { done: 'Element deleted.' };
	}
};
