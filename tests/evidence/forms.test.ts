import { describe, expect, it } from 'vitest';
import {
	evidenceAnswerFormSchema,
	evidenceDeleteFormSchema,
	evidenceRequestFormSchema,
	evidenceRequestFromForm
} from '$lib/evidence/forms';
import { readForm } from '$lib/server/forms';

// The evidence forms as a browser posts them (Envelo's own forms: common practice, no source).
const ITEM = '00000000-0000-4000-8000-0000000000a1';

describe('evidence request form', () => {
	it('reads the note as typed and the date without stray spaces', () => {
		expect(
			evidenceRequestFromForm({ itemId: ITEM, note: 'A photo with a tape measure', dueDate: ' 2026-12-24 ' })
		).toEqual({
			note: 'A photo with a tape measure',
			dueDate: '2026-12-24'
		});
	});

	it('keeps a blank note and date blank, for the service to say what is missing', async () => {
		const fd = new FormData();
		fd.set('itemId', ITEM);
		const posted = await readForm(fd, evidenceRequestFormSchema);
		expect(posted.valid).toBe(true);
		expect(evidenceRequestFromForm(posted.data)).toEqual({ note: '', dueDate: '' });
	});

	it('refuses an item that is not an id', async () => {
		const fd = new FormData();
		fd.set('itemId', 'nope');
		const posted = await readForm(fd, evidenceRequestFormSchema);
		expect(posted.valid).toBe(false);
		expect(posted.errors.itemId).toEqual(['No such audit item.']);
	});
});

describe('evidence button forms', () => {
	it('name the field that is not an id', async () => {
		const fd = new FormData();
		fd.set('itemId', ITEM);
		fd.set('requestId', '12');
		const answer = await readForm(fd, evidenceAnswerFormSchema);
		expect(answer.errors.requestId).toEqual(['is not an evidence request']);
		const gone = await readForm(new FormData(), evidenceDeleteFormSchema);
		expect(gone.valid).toBe(false);
		expect(gone.errors.evidenceId).toBeDefined();
	});
});
