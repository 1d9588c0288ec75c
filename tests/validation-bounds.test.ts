import { describe, expect, it } from 'vitest';
import {
	elementFieldsSchema,
	dwellingListQuerySchema,
	elementUpdateSchema,
	thicknessRequestSchema
} from '$lib/dwellings/schema';
import { listQuerySchema } from '$lib/library/schema';
import { reachQuerySchema } from '$lib/server/library/reach-schema';
import { versionSchema as junctionVersion } from '$lib/junctions/schema';
import { PG_INT_MAX } from '$lib/validation';

// Whole numbers that are stored in, or compared with, a PostgreSQL integer column (at most 2^31 − 1,
// PostgreSQL 15 documentation, 8.1.1 "Integer Types") or used for an OFFSET must be refused with the
// field named before they reach the database, which would otherwise answer "out of range" as a
// server error. The bounds chosen (10 000 elements, page 100 000, layer 999) are Envelo's own.
const first = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
	r.success ? null : { path: r.error!.issues[0].path.join('.'), message: r.error!.issues[0].message };

const element = { name: 'Wall', kind: 'external-wall', area: 10 };

describe('whole numbers within what the database holds', () => {
	it('refuses an element position beyond the integer column', () => {
		expect(first(elementFieldsSchema.safeParse({ ...element, position: 2 ** 31 }))).toEqual({
			path: 'position',
			message: 'must be at most 10000'
		});
		expect(elementFieldsSchema.safeParse({ ...element, position: 3 }).success).toBe(true);
	});

	it('refuses a version beyond the integer column, for every record that carries one', () => {
		expect(first(elementUpdateSchema.safeParse({ ...element, version: PG_INT_MAX + 1 }))?.path).toBe(
			'version'
		);
		expect(elementUpdateSchema.safeParse({ ...element, version: PG_INT_MAX }).success).toBe(true);
		expect(junctionVersion.safeParse(2 ** 40).success).toBe(false);
	});

	it('refuses a page too deep to mean anything, on every list', () => {
		for (const schema of [dwellingListQuerySchema, listQuerySchema, reachQuerySchema]) {
			expect(first(schema.safeParse({ page: '1e20' }))?.path).toBe('page');
			expect(schema.safeParse({ page: '400' }).success).toBe(true);
		}
	});

	it('refuses a layer number past any build-up', () => {
		expect(
			first(thicknessRequestSchema.safeParse({ input: {}, layerIndex: 2 ** 31, targetU: 0.3 }))?.path
		).toBe('layerIndex');
	});
});
