// The limit-table pages' forms read into the shared schema's input (src/lib/limit-tables/forms.ts): one
// text per element kind, read as a maximum U (a decimal comma too), a blank kind left without a limit,
// and the schema's messages brought back to the kind's field. The decimal comma: ISO 80000-1, 7.3.2 (the
// decimal sign is a comma or a point on the line; from memory); the rest is Envelo's own rule (common
// practice, no source). The limits are invented.
import { describe, expect, it } from 'vitest';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	blankLimitTableForm,
	limitTableEditFormSchema,
	limitTableFieldOf,
	limitTableFormOf,
	limitTableFormSchema,
	limitTableInputFromForm,
	limitTableUpdateFromForm,
	type LimitTableForm
} from '../../src/lib/limit-tables/forms';
import {
	LIMIT_KINDS,
	limitTableInputSchema,
	limitTableUpdateSchema
} from '../../src/lib/limit-tables/schema';
import { fieldIssues } from '../../src/lib/validation';

const at = (kind: string) => LIMIT_KINDS.indexOf(kind as (typeof LIMIT_KINDS)[number]);
const typed = (limits: Record<string, string>, over: Partial<LimitTableForm> = {}): LimitTableForm => {
	const limit = LIMIT_KINDS.map(() => '');
	for (const [kind, v] of Object.entries(limits)) limit[at(kind)] = v;
	return { ...blankLimitTableForm(), name: 'Invented scheme', edition: '1', limit, ...over };
};

describe('limitTableInputFromForm', () => {
	it('reads a decimal comma as a number', () => {
		const input = limitTableInputFromForm(typed({ 'flat-roof': '0,15', 'external-wall': '0.28' }));
		expect(input.limits).toEqual({ 'flat-roof': 0.15, 'external-wall': 0.28 });
		expect(limitTableInputSchema.safeParse(input).success).toBe(true);
	});

	it('leaves a blank kind without a limit, and a blank date as none', () => {
		const input = limitTableInputFromForm(typed({ window: '1.6', door: '   ' }));
		expect(input.limits).toEqual({ window: 1.6 });
		expect(input.dated).toBeNull();
	});

	it('keeps text that is not a number, for the schema to name beside its kind', () => {
		const parsed = limitTableInputSchema.safeParse(
			limitTableInputFromForm(typed({ 'external-wall': '0', 'flat-roof': 'abc' }))
		);
		expect(parsed.success).toBe(false);
		const issues = fieldIssues(parsed.error!);
		expect(issues).toContainEqual({
			path: 'limits.external-wall',
			message: 'must be greater than 0 W/(m²·K)'
		});
		expect(issues).toContainEqual({ path: 'limits.flat-roof', message: 'must be a number in W/(m²·K)' });
	});

	it('a form with no limit at all is refused as a whole', () => {
		const parsed = limitTableInputSchema.safeParse(limitTableInputFromForm(typed({})));
		expect(fieldIssues(parsed.error!).map((i) => i.path)).toEqual(['limits']);
	});

	it('the new table’s default box is passed on; the edit form has none, and adds its version', () => {
		expect(limitTableInputFromForm(typed({ window: '1.6' }, { isDefault: true })).isDefault).toBe(true);
		const { isDefault: _, ...rest } = typed({ window: '1.6' });
		const update = limitTableUpdateFromForm({ ...rest, version: 2, confirm: false });
		expect('isDefault' in update).toBe(false);
		expect(update.version).toBe(2);
		expect(limitTableUpdateSchema.safeParse(update).success).toBe(true);
	});
});

describe('limitTableFieldOf', () => {
	it('maps a kind’s path back to its field in the repeated limits', () => {
		expect(limitTableFieldOf('limits.flat-roof')).toBe(`limit[${at('flat-roof')}]`);
		expect(limitTableFieldOf('limits.window')).toBe(`limit[${at('window')}]`);
	});

	it('keeps the form’s own fields, the limits as a whole, and leaves the rest to the form’s message', () => {
		expect(limitTableFieldOf('edition')).toBe('edition');
		expect(limitTableFieldOf('dated')).toBe('dated');
		expect(limitTableFieldOf('limits')).toBe('limit._errors');
		expect(limitTableFieldOf('limits.not-a-kind')).toBeUndefined();
		expect(limitTableFieldOf('(body)')).toBeUndefined();
	});
});

describe('limitTableFormOf', () => {
	it('starts the edit form from the stored table, one text per kind', () => {
		const f = limitTableFormOf({
			name: 'A',
			edition: '1',
			dated: null,
			source: null,
			version: 5,
			limits: { window: 1.6 }
		});
		expect(f.limit[at('window')]).toBe('1.6');
		expect(f.limit[at('door')]).toBe('');
		expect(f).toMatchObject({ dated: '', source: '', version: 5, confirm: false });
	});
});

describe('the forms as superforms reads a post', () => {
	it('reads one text per kind, in order, blanks kept in their place', async () => {
		const fd = new FormData();
		fd.set('name', 'Invented scheme');
		fd.set('edition', '1');
		LIMIT_KINDS.forEach((kind) => fd.append('limit', kind === 'flat-roof' ? '0,15' : ''));
		const form = await superValidate(fd, zod4(limitTableFormSchema));
		expect(form.valid).toBe(true);
		expect(form.data.limit).toHaveLength(LIMIT_KINDS.length);
		expect(form.data.limit[at('flat-roof')]).toBe('0,15');
		expect(form.data.isDefault).toBe(false);
	});

	it('reads the edit form’s confirmation box and version', async () => {
		const fd = new FormData();
		fd.set('version', '7');
		fd.set('confirm', 'on');
		const form = await superValidate(fd, zod4(limitTableEditFormSchema));
		expect(form.data.version).toBe(7);
		expect(form.data.confirm).toBe(true);
	});
});
