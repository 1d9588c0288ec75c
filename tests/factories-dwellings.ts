// Factories for dwellings and elements tests: rows written through the test database directly.
import { randomBytes } from 'node:crypto';
import { tdb } from './factories';

/** A member as requireRole() returns it, for calling server modules. */
export function asMember(m: {
	id: string;
	email: string;
	role: 'assessor' | 'supervisor' | 'admin';
	organisationId: string;
}) {
	return {
		user: { id: m.id, email: m.email, name: null },
		organisationId: m.organisationId,
		organisationName: 'Test',
		role: m.role
	};
}

export const ref = (prefix = 'T') => `${prefix}-${randomBytes(3).toString('hex')}`;

/** Twelve months of an invented climate (for tests only, not a real place). */
export const TEST_MONTHS = [-1, 0, 3, 6, 10, 13, 15, 15, 12, 8, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [90, 88, 84, 80, 78, 78, 80, 82, 85, 88, 90, 91][i]
}));

export async function makeClimate(
	organisationId: string,
	name = `Climate ${randomBytes(3).toString('hex')}`
) {
	const [row] = await tdb()('climates')
		.insert({
			organisation_id: organisationId,
			name,
			source: 'invented for tests',
			illustrative: true,
			months: JSON.stringify(TEST_MONTHS)
		})
		.returning('id');
	return row.id as string;
}

export async function makeLimitTable(
	organisationId: string,
	limits: Record<string, number>,
	isDefault = true
) {
	const [row] = await tdb()('limit_tables')
		.insert({
			organisation_id: organisationId,
			name: `Limits ${randomBytes(3).toString('hex')}`,
			edition: 'test',
			is_default: isDefault,
			limits: JSON.stringify(limits)
		})
		.returning('id');
	return row.id as string;
}

/** Plasterboard, 100 mm mineral wool, brick: a simple wall (generic values, common practice, no source). */
export const WALL = {
	name: 'Test wall',
	kind: 'external-wall',
	area: 20,
	buildUp: {
		layers: [
			{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 10 },
			{ name: 'Mineral wool', thicknessMm: 100, lambda: 0.04, mu: 1 },
			{ name: 'Brick', thicknessMm: 100, lambda: 0.5, mu: 10 }
		]
	},
	internal: { temperature: 20, humidityClass: 3 }
};
