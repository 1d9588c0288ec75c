// Test data for the material library: materials written through the library module, and dwellings
// with elements whose layers point at material revisions (as the element editor stores them).
import { randomBytes } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { tdb } from './factories';

export const uniqueCode = (prefix = 'T') => `${prefix}-${randomBytes(4).toString('hex').toUpperCase()}`;

/** Values of an ordinary insulation board; override what a test needs. */
export function boardValues(overrides: Record<string, unknown> = {}) {
	return {
		code: uniqueCode(),
		name: 'Test insulation board',
		category: 'insulation',
		lambda: 0.035,
		lambdaKind: 'declared',
		muDry: 1,
		density: 30,
		specificHeat: 1030,
		source: 'Invented for a test',
		...overrides
	};
}

/** A dwelling with one external wall whose build-up is given. */
export async function makeElement(organisationId: string, buildUp: unknown) {
	const [d] = await tdb()('dwellings')
		.insert({
			organisation_id: organisationId,
			reference: `D-${randomBytes(3).toString('hex')}`,
			address: '1 Test Street'
		})
		.returning('id');
	const [e] = await tdb()('elements')
		.insert({
			organisation_id: organisationId,
			dwelling_id: d.id,
			name: 'External wall',
			kind: 'external-wall',
			area: 10,
			heat_flow: 'horizontal',
			build_up: JSON.stringify(buildUp),
			internal: JSON.stringify({ temperature: 20 })
		})
		.returning('id');
	return { dwellingId: d.id as string, elementId: e.id as string };
}

/** A fixture file's bytes. */
export const fixture = (path: string) =>
	new Uint8Array(readFileSync(new URL(`../fixtures/${path}`, import.meta.url)));

/** Everything in the library tables of an organisation, to prove an import left it unchanged. */
export async function librarySnapshot(organisationId: string) {
	const materials = await tdb()('materials').where({ organisation_id: organisationId }).orderBy('id');
	const revisions = await tdb()('material_revisions')
		.where({ organisation_id: organisationId })
		.orderBy('id');
	const mappings = await tdb()('import_mappings').where({ organisation_id: organisationId }).orderBy('id');
	return JSON.stringify({ materials, revisions, mappings });
}

/** A CSV of n generated materials in the export's columns. */
export function generatedCsv(n: number, prefix = 'GEN') {
	const head =
		'code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes';
	const lines = [head];
	for (let i = 0; i < n; i++) {
		const lambda = (0.03 + (i % 20) / 1000).toFixed(3);
		lines.push(
			`${prefix}-${String(i).padStart(6, '0')},Generated board ${i},generic,insulation,${lambda},declared,,1,,,${20 + (i % 50)},1030,20,300,Invented for a test,,,no,`
		);
	}
	return lines.join('\n') + '\n';
}
