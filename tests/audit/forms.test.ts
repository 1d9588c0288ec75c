import { describe, expect, it } from 'vitest';
import {
	batchFieldOf,
	checkDecision,
	checkNewBatch,
	checkResubmit,
	newBatchFormDefaults,
	newBatchFormSchema,
	newBatchInputFromForm,
	type NewBatchForm
} from '$lib/audit/forms';
import { readForm } from '$lib/server/forms';

// Reading the audit pages' forms into the audit's input. The rules (a percentage above 0 and at most
// 100, a whole minimum per assessor, a comment for anything but "accepted") are Envelo's own: common
// practice, no source. The decimal comma is how much of Europe writes a decimal number (common practice).

const form = (over: Partial<NewBatchForm> = {}): Omit<NewBatchForm, 'file'> => {
	const { file: _file, ...d } = newBatchFormDefaults({ references: [], name: 'Spring check' });
	return { ...d, ...over };
};

describe('new batch form', () => {
	it('reads a decimal comma in the percentage', () => {
		const r = checkNewBatch(form({ percent: '12,5' }), undefined);
		expect(r.ok).toBe(true);
		if (r.ok)
			expect(r.input.sampling).toMatchObject({ rule: 'random', percent: 12.5, minimumPerAssessor: 1 });
	});

	it('leaves blank fields out: no seed, no dates, a blank minimum is 0', () => {
		const input = newBatchInputFromForm(
			form({ minimumPerAssessor: ' ', seed: '', issuedFrom: '' }),
			undefined
		);
		expect(input.seed).toBeUndefined();
		expect(input.filter.issuedFrom).toBeUndefined();
		expect(input.sampling).toMatchObject({ minimumPerAssessor: 0 });
	});

	it('says a blank percentage beside its field', () => {
		const r = checkNewBatch(form({ percent: '' }), undefined);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.issues).toContainEqual({ field: 'percent', message: 'must be a number' });
	});

	it('maps the input paths back to the form fields', () => {
		const r = checkNewBatch(
			form({ name: '', minimumPerAssessor: '2.5', issuedFrom: '2026-05-01', issuedTo: '2026-04-01' }),
			undefined
		);
		expect(r.ok).toBe(false);
		if (!r.ok)
			expect(r.issues).toEqual(
				expect.arrayContaining([
					{ field: 'name', message: 'give the batch a name' },
					{ field: 'minimumPerAssessor', message: 'must be a whole number' },
					{ field: 'issuedTo', message: 'must be on or after the start date' }
				])
			);
		expect(batchFieldOf('filter.assessorId')).toBe('assessorId');
		expect(batchFieldOf('filter')).toBe('statuses');
		expect(batchFieldOf('filter.statuses.2')).toBe('statuses');
		expect(batchFieldOf('sampling.percent')).toBe('percent');
		expect(batchFieldOf('references')).toBe('references');
		expect(batchFieldOf('(id)')).toBeUndefined();
	});

	it('takes any name for a count, none ticked is every status, and needs references from a list', () => {
		const preview = newBatchInputFromForm(form({ name: '', statuses: [] }), undefined, true);
		expect(preview.name).toBe('preview');
		expect(preview.filter.statuses).toBeUndefined();
		const r = checkNewBatch(form({ source: 'references', rule: 'all' }), []);
		expect(r.ok).toBe(false);
		if (!r.ok)
			expect(r.issues).toContainEqual({
				field: 'references',
				message: 'give at least one dwelling reference'
			});
		const ok = checkNewBatch(form({ source: 'references', rule: 'all' }), ['NF-014']);
		expect(ok.ok && ok.input.references).toEqual(['NF-014']);
	});

	it('starts from a list handed over by another page: all of it, from the references', () => {
		const d = newBatchFormDefaults({ references: ['A-1', 'A-2'], name: 'Correction' });
		expect(d).toMatchObject({
			source: 'references',
			rule: 'all',
			references: 'A-1\nA-2',
			name: 'Correction'
		});
		expect(newBatchFormDefaults({ references: [], name: '' })).toMatchObject({
			source: 'filter',
			rule: 'random'
		});
	});

	it('reads a post as a browser sends it: an unticked box is false, an empty file is none', async () => {
		const fd = new FormData();
		fd.set('name', 'Posted');
		fd.set('source', 'filter');
		fd.append('statuses', 'draft');
		fd.append('statuses', 'issued');
		fd.set('rule', 'random');
		fd.set('percent', '7,5');
		fd.set('minimumPerAssessor', '0');
		fd.set('file', new File([], ''));
		const posted = await readForm(fd, newBatchFormSchema);
		expect(posted.valid).toBe(true);
		expect(posted.data.includeFlagged).toBe(false);
		expect(posted.data.file).toBeUndefined();
		expect(posted.data.statuses).toEqual(['draft', 'issued']);
		const r = checkNewBatch(posted.data, undefined);
		expect(r.ok && r.input.sampling).toEqual({
			rule: 'random',
			percent: 7.5,
			minimumPerAssessor: 0,
			includeFlagged: false
		});
	});
});

describe('decision form', () => {
	it('asks for a comment beside the comment for a return', () => {
		const r = checkDecision({ decision: 'returned', comment: '  ' });
		expect(r).toEqual({
			ok: false,
			issues: [{ field: 'comment', message: 'say what the assessor should know or correct' }]
		});
	});

	it('refuses a blank decision beside the decision', () => {
		const r = checkDecision({ decision: '', comment: '' });
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.issues[0].field).toBe('decision');
	});

	it('accepts without a comment', () => {
		expect(checkDecision({ decision: 'accepted', comment: '' })).toEqual({
			ok: true,
			input: { decision: 'accepted', comment: '' }
		});
	});
});

describe('resubmit form', () => {
	it('needs what was corrected, beside the comment', () => {
		expect(checkResubmit({ comment: ' ' })).toEqual({
			ok: false,
			issues: [{ field: 'comment', message: 'say what you corrected' }]
		});
		expect(checkResubmit({ comment: ' Loft insulation re-measured. ' })).toEqual({
			ok: true,
			input: { comment: 'Loft insulation re-measured.' }
		});
	});
});
