import { error, fail, redirect } from '@sveltejs/kit';
import { setError, message } from 'sveltekit-superforms';
import { formFor, invalidText, readForm, refuseAction, refuseForm } from '$lib/server/forms';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	copyDwelling,
	getDwellingPage,
	getReturnNote,
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
	archiveFormSchema,
	copyFormSchema,
	deleteElementFormSchema,
	dwellingFieldsFromForm,
	dwellingFormSchema,
	elementButtonSchema,
	floorAreaText,
	moveElementFormSchema,
	reopenFormSchema
} from '$lib/dwellings/forms';
import { readIssueChanges } from '$lib/server/reports/changes';
import { listJunctions } from '$lib/server/junctions';
import { readDwellingHeatCapacity } from '$lib/server/dwellings/heat-capacity';
import { evidencePanel } from '$lib/server/evidence';
import { ConflictError, ForbiddenError } from '$lib/server/errors';
import { reopenAction } from '$lib/server/dwellings/reopen-action';

export const load = async (event) => {
	const member = requireMember(event);
	// The dwelling, its elements (U and checks from their stored results), limit table, climate and the
	// form's options, in one query.
	const page = await getDwellingPage(member.organisationId, event.params.dwellingId);
	if (!page) error(404, 'No such dwelling.');
	const { options, ...overview } = page;
	const d = overview.dwelling;
	const [returned, changes, junctions, evidence, form, copyForm, reopenForm] = await Promise.all([
		d.status === 'returned' ? getReturnNote(member.organisationId, d.id) : null,
		// Only a dwelling marked as changed (a count above 0) has a list to work out: every write that can
		// change what was issued refreshes or raises the mark (reports/changes.ts, reports/marks.ts).
		d.issueChanges ? readIssueChanges(member.organisationId, d.id, d.issueChanges) : null,
		listJunctions(member.organisationId, d.id),
		evidencePanel(member, d.id),
		formFor(dwellingFormSchema, {
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
		}),
		formFor(copyFormSchema, { reference: '', address: '', kind: 'copy' }, 'copy'),
		formFor(reopenFormSchema, { reason: '', version: d.version }, 'reopen')
	]);
	// Streamed after the page: it reads every element's build-up, which the overview leaves out.
	const heatCapacity = readDwellingHeatCapacity(member.organisationId, d.id, d.floorArea);
	return {
		...overview,
		options,
		returned,
		changes,
		junctions,
		evidence,
		form,
		copyForm,
		reopenForm,
		heatCapacity
	};
};

export const actions = {
	/** Reopen an accepted dwelling, or one awaiting review, for changes, with a reason. */
	reopen: (event) =>
		reopenAction(event, {
			done: 'Reopened: the reason is logged, and the supervisor sees it with every change.'
		}),
	update: async function update(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, dwellingFormSchema);
		if (!form.valid) return fail(400, { form });
		const { version, ...fields } = form.data;
		try {
			await updateDwelling(member, event.params.dwellingId, { ...dwellingFieldsFromForm(fields), version });
		} catch (e) {
			// A change of assessor the rule does not allow: said beside the assessor's field.
			if (e instanceof ForbiddenError) return setError(form, 'assessorId', e.message, { status: 403 });
			if (e instanceof ConflictError) return message(form, e.message, { status: 409 });
			return refuseForm(form, e);
		}
		return message(form, 'Saved.');
	},
	copy: async function copy(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, copyFormSchema, 'copy');
		if (!form.valid) return fail(400, { form });
		const { kind, ...copy } = form.data;
		let id: string;
		try {
			({ id } = await copyDwelling(member, event.params.dwellingId, {
				...copy,
				asBuilt: kind === 'as-built'
			}));
		} catch (e) {
			return refuseForm(form, e);
		}
		redirect(303, `/dwellings/${id}`);
	},
	archive: async function archive(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, archiveFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		const archived = form.data.archived === 'true';
		try {
			await setDwellingArchived(member, event.params.dwellingId, archived, form.data.version);
		} catch (e) {
			return refuseAction(e);
		}
		return { done: archived ? 'Archived.' : 'Restored to draft.' };
	},
	duplicateElement: async function duplicate(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, elementButtonSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			const copy = await duplicateElement(member, form.data.elementId);
			return { done: `Added “${copy.name}”.` };
		} catch (e) {
			return refuseAction(e);
		}
	},
	/** Move one element a place up or down (a reorder of the whole list, checked against the dwelling's version). */
	moveElement: async function move(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, moveElementFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		const { elementId: id, direction, version } = form.data;
		const elements = await listElementSummaries(member.organisationId, event.params.dwellingId);
		const ids = elements.map((e) => e.id);
		const from = ids.indexOf(id);
		if (from < 0) return fail(400, { error: 'elementId: is not an element of this dwelling.' });
		const to = direction === 'up' ? from - 1 : from + 1;
		if (to < 0 || to >= ids.length)
			return fail(400, { error: `This element is already ${direction === 'up' ? 'first' : 'last'}.` });
		[ids[from], ids[to]] = [ids[to], ids[from]];
		try {
			const r = await reorderElements(member, event.params.dwellingId, { ids, version });
			return {
				done: `Moved “${elements[from].name}” ${direction} to place ${to + 1} of ${ids.length}.`,
				moved: { id, direction, version: r.version }
			};
		} catch (e) {
			return refuseAction(e);
		}
	},
	deleteElement: async function remove(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, deleteElementFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			await deleteElement(member, form.data.elementId, form.data.version);
		} catch (e) {
			return refuseAction(e);
		}
		return { done: 'Element deleted.' };
	}
};
