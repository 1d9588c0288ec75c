import { describe, expect, it } from 'vitest';
import {
	templateFieldOf,
	templateFormSchema,
	templateFormValues,
	templatePatchFromForm
} from '../../src/lib/templates/forms';
import { templatePatchSchema } from '../../src/lib/templates/schema';

// Reading the template edit form into a template patch (Envelo's own rules: common practice, no source).
describe('templatePatchFromForm', () => {
	it('reads the edit form as a patch that the template schema accepts', () => {
		const patch = templatePatchFromForm({
			name: ' Timber frame wall ',
			kind: 'external-wall',
			description: '',
			version: 3
		});
		const parsed = templatePatchSchema.parse(patch);
		expect(parsed).toEqual({
			name: 'Timber frame wall',
			kind: 'external-wall',
			description: null,
			version: 3
		});
	});

	it('a blank name is refused under the name field', () => {
		const parsed = templatePatchSchema.safeParse(
			templatePatchFromForm({ name: '  ', kind: 'external-wall', description: '', version: 1 })
		);
		const issues = parsed.error?.issues.map((i) => [templateFieldOf(i.path.join('.')), i.message]);
		expect(issues).toEqual([['name', 'name is required']]);
	});

	it('a form without its version does not pass', () => {
		const form = templateFormSchema.safeParse({ name: 'Wall', kind: 'external-wall', description: '' });
		expect(form.success).toBe(false);
		expect(form.error?.issues[0].path).toEqual(['version']);
	});

	it('starts from the stored template', () => {
		expect(
			templateFormValues({ name: 'Wall', kind: 'external-wall', description: null, version: 2 })
		).toEqual({ name: 'Wall', kind: 'external-wall', description: '', version: 2 });
		expect(templateFieldOf('buildUp')).toBeUndefined();
	});
});
