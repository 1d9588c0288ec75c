import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { isActionFailure, isHttpError } from '@sveltejs/kit';
import { formFor, invalidText, readForm, refuseAction, refuseForm } from '../../src/lib/server/forms';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../../src/lib/server/errors';
import { versionSchema } from '../../src/lib/validation';

// The kernel every form action goes through (no outside source: these are Envelo's own answers).
const schema = z.object({ name: z.string().min(1, 'Give it a name.'), version: versionSchema });

const post = (fields: Record<string, string>) => {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.set(k, v);
	return new Request('http://127.0.0.1/x?/save', { method: 'POST', body });
};

describe('readForm', () => {
	it('reads a post against its schema, numbers as numbers', async () => {
		const form = await readForm(post({ name: 'Loft', version: '3' }), schema);
		expect(form.valid).toBe(true);
		expect(form.data).toEqual({ name: 'Loft', version: 3 });
	});

	it('says which field failed and why', async () => {
		const form = await readForm(post({ name: '', version: '0' }), schema);
		expect(form.valid).toBe(false);
		expect(form.errors.name).toEqual(['Give it a name.']);
		expect(invalidText(form)).toBe('name: Give it a name.; version: must be ≥ 1');
	});

	it('takes the id the page posted, so one of several forms is answered', async () => {
		const body = post({ name: 'Loft', version: '1', __superform_id: 'email-1' });
		expect((await readForm(body, schema)).id).toBe('email-1');
	});

	it('starts a form from the values given, under its id', async () => {
		const form = await formFor(schema, { name: 'Wall', version: 2 }, 'first');
		expect(form).toMatchObject({ id: 'first', valid: false, data: { name: 'Wall', version: 2 } });
		expect(form.errors).toEqual({});
	});
});

describe('refuseForm', () => {
	it('puts each issue beside its field and the rest in the form’s own error', async () => {
		const form = await readForm(post({ name: 'Loft', version: '1' }), schema);
		const out = refuseForm(
			form,
			new ValidationError([
				{ path: 'name', message: 'is already taken' },
				{ path: 'layers.0.thickness', message: 'must be above 0' }
			])
		);
		expect(isActionFailure(out)).toBe(true);
		expect(out.status).toBe(400);
		expect(out.data.form.errors.name).toEqual(['is already taken']);
		expect(out.data.form.errors._errors).toEqual(['layers.0.thickness: must be above 0']);
	});

	it('words a conflict as the form’s error, with its status', async () => {
		const form = await readForm(post({ name: 'Loft', version: '1' }), schema);
		const out = refuseForm(form, new ConflictError('Someone else saved it first.'));
		expect(out.status).toBe(409);
		expect(out.data.form.errors._errors).toEqual(['Someone else saved it first.']);
	});

	it('renames a service’s path and lets the page word the rest', async () => {
		const form = await readForm(post({ name: 'Loft', version: '1' }), schema);
		const out = refuseForm(form, new ValidationError([{ path: 'label', message: 'is too long' }]), {
			field: (p) => (p === 'label' ? 'name' : undefined),
			text: () => 'unused'
		});
		expect(out.data.form.errors.name).toEqual(['is too long']);
		expect(out.data.form.errors._errors).toBeUndefined();
	});

	it('answers a record that is not there with the 404 page and throws anything unexpected on', async () => {
		const form = await readForm(post({ name: 'Loft', version: '1' }), schema);
		try {
			refuseForm(form, new NotFoundError('No such dwelling.'));
			expect.unreachable();
		} catch (e) {
			expect(isHttpError(e, 404)).toBe(true);
		}
		const fault = new TypeError('a bug');
		expect(() => refuseForm(form, fault)).toThrow(fault);
	});
});

describe('refuseAction', () => {
	it('gives a button form one line, its status and each reason', () => {
		const out = refuseAction(new ValidationError([{ path: 'version', message: 'must be ≥ 1' }]));
		expect(out.status).toBe(400);
		expect(out.data).toEqual({ error: 'version: must be ≥ 1', issues: ['must be ≥ 1'] });
		expect(refuseAction(new ForbiddenError('Only an admin does this.')).data.error).toBe(
			'Only an admin does this.'
		);
	});

	it('answers a malformed id the database noticed as a 400, not a 500', () => {
		const pg = Object.assign(new Error('invalid input syntax for type uuid: "x"'), { code: '22P02' });
		expect(refuseAction(pg).status).toBe(400);
	});
});
