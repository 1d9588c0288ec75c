// The climate pages' forms read into the shared schema's input (src/lib/climates/forms.ts): what a person
// types is kept as text in the form, read as numbers here (a decimal comma too), and the schema's
// messages come back to the field they are about. The decimal comma: ISO 80000-1, 7.3.2 (the decimal
// sign is a comma or a point on the line; from memory); the rest is Envelo's own rule (common practice,
// no source). The figures are invented.
import { describe, expect, it } from 'vitest';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	blankClimateForm,
	climateEditFormSchema,
	climateFieldOf,
	climateFormOf,
	climateFormSchema,
	climateImportFieldOf,
	climateImportFormSchema,
	climateInputFromForm,
	climateUpdateFromForm,
	type ClimateForm
} from '../../src/lib/climates/forms';
import { climateInputSchema, climateUpdateSchema } from '../../src/lib/climates/schema';
import { fieldIssues } from '../../src/lib/validation';

const typed = (over: Partial<ClimateForm> = {}): ClimateForm => ({
	name: 'Invented town',
	source: 'Invented test figures',
	illustrative: true,
	temperature: Array.from({ length: 12 }, (_, i) => String(i - 2)),
	relativeHumidity: Array.from({ length: 12 }, () => '80'),
	...over
});

describe('climateInputFromForm', () => {
	it('reads a decimal comma (and a minus sign) as a number', () => {
		const t = typed().temperature;
		t[0] = '-0,5';
		t[1] = '\u22121,5';
		const input = climateInputFromForm(typed({ temperature: t }));
		expect(input.months[0]).toEqual({ month: 1, temperature: -0.5, relativeHumidity: 80 });
		expect(input.months[1].temperature).toBe(-1.5);
		expect(climateInputSchema.safeParse(input).success).toBe(true);
	});

	it('numbers the months from their place, January first', () => {
		const input = climateInputFromForm(typed());
		expect(input.months.map((m) => m.month)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
	});

	it('leaves a blank field out, so the schema says the value is missing', () => {
		const rh = typed().relativeHumidity;
		rh[6] = '  ';
		const input = climateInputFromForm(typed({ relativeHumidity: rh }));
		expect(input.months[6].relativeHumidity).toBeUndefined();
		const parsed = climateInputSchema.safeParse(input);
		expect(parsed.success).toBe(false);
		expect(fieldIssues(parsed.error!).map((i) => i.path)).toEqual(['months.6.relativeHumidity']);
	});

	it('keeps text that is not a number, for the schema to name', () => {
		const rh = typed().relativeHumidity;
		rh[6] = '1O5';
		const input = climateInputFromForm(typed({ relativeHumidity: rh }));
		expect(input.months[6].relativeHumidity).toBe('1O5');
		const parsed = climateInputSchema.safeParse(input);
		expect(fieldIssues(parsed.error!)).toEqual([
			{ path: 'months.6.relativeHumidity', message: 'must be a finite number, got the text "1O5"' }
		]);
	});

	it('a blank form gives twelve months, each missing both values', () => {
		const input = climateInputFromForm(blankClimateForm());
		expect(input.months).toHaveLength(12);
		expect(input.months.every((m) => m.temperature === undefined)).toBe(true);
	});

	it('an edit form adds the version it was opened on', () => {
		const update = climateUpdateFromForm({ ...typed(), version: 3 });
		expect(update.version).toBe(3);
		expect(climateUpdateSchema.safeParse(update).success).toBe(true);
	});
});

describe('climateFieldOf', () => {
	it('maps a month path back to the repeated field and its place', () => {
		expect(climateFieldOf('months.3.temperature')).toBe('temperature[3]');
		expect(climateFieldOf('months.11.relativeHumidity')).toBe('relativeHumidity[11]');
	});

	it('keeps the form’s own fields, and leaves the rest to the form’s message', () => {
		expect(climateFieldOf('name')).toBe('name');
		expect(climateFieldOf('version')).toBe('version');
		expect(climateFieldOf('months')).toBeUndefined();
		expect(climateFieldOf('months.2.month')).toBeUndefined();
		expect(climateFieldOf('months.12.temperature')).toBeUndefined();
	});

	it('the import form places only its own fields (the months are the file’s)', () => {
		expect(climateImportFieldOf('source')).toBe('source');
		expect(climateImportFieldOf('months.3.temperature')).toBeUndefined();
	});
});

describe('climateFormOf', () => {
	it('starts the edit form from the stored climate, in calendar order, as text', () => {
		const months = Array.from({ length: 12 }, (_, i) => ({
			month: 12 - i,
			temperature: 12 - i + 0.5,
			relativeHumidity: 70
		}));
		const f = climateFormOf({ name: 'A', source: 'B', illustrative: false, version: 4, months });
		expect(f.temperature[0]).toBe('1.5');
		expect(f.temperature[11]).toBe('12.5');
		expect(f.version).toBe(4);
	});
});

describe('the forms as superforms reads a post', () => {
	it('reads the repeated month fields as arrays of text and the box as true', async () => {
		const fd = new FormData();
		fd.set('name', 'Invented town');
		fd.set('source', 'Invented test figures');
		fd.set('illustrative', 'on');
		for (let i = 0; i < 12; i++) {
			fd.append('temperature', i === 0 ? '-0,5' : String(i));
			fd.append('relativeHumidity', '80');
		}
		const form = await superValidate(fd, zod4(climateFormSchema));
		expect(form.valid).toBe(true);
		expect(form.data.temperature[0]).toBe('-0,5');
		expect(form.data.illustrative).toBe(true);
	});

	it('refuses an edit without its version', async () => {
		const fd = new FormData();
		fd.set('name', 'x');
		const form = await superValidate(fd, zod4(climateEditFormSchema));
		expect(form.valid).toBe(false);
		expect(form.errors.version).toBeDefined();
	});

	it('reads the import form’s file as a File, and an empty file input as none', async () => {
		const fd = new FormData();
		fd.set('name', 'Invented town');
		fd.set('source', 'Invented test figures');
		fd.set('file', new File(['month;temperature\n'], 'c.csv', { type: 'text/csv' }));
		fd.set('text', '');
		const form = await superValidate(fd, zod4(climateImportFormSchema));
		expect(form.valid).toBe(true);
		expect(form.data.file).toBeInstanceOf(File);
		expect(form.data.file?.name).toBe('c.csv');

		fd.set('file', new File([], ''));
		const none = await superValidate(fd, zod4(climateImportFormSchema));
		expect(none.valid).toBe(true);
		expect(none.data.file).toBeUndefined();
	});
});
