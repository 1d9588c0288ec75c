// Demo library: about forty generic materials with typical values, each naming its source, all marked
// indicative, for both demo organisations. Idempotent: a code already in an organisation's library is
// left as it is (its revisions may have moved on). The file is the one a user could import by hand.
import { readFileSync } from 'node:fs';
import Papa from 'papaparse';

const ORGS = ['00000000-0000-4000-8000-000000000001', '00000000-0000-4000-8000-000000000002'];
const FILE = new URL('../../fixtures/materials/demo-library.csv', import.meta.url);
const NUMBERS = [
	'lambda',
	'resistance',
	'mu_dry',
	'mu_wet',
	'sd',
	'density',
	'specific_heat',
	'thickness_min_mm',
	'thickness_max_mm'
];
const TEXTS = ['lambda_kind', 'source', 'source_issued', 'source_expires', 'notes'];

/** @param {import('knex').Knex} knex */
export async function seed(knex) {
	const text = readFileSync(FILE, 'utf8').replace(/^\uFEFF/, '');
	/** @type {Record<string, string>[]} */
	const rows = Papa.parse(text, { header: true, skipEmptyLines: true }).data;
	await knex.transaction(async (trx) => {
		for (const org of ORGS) {
			if (!(await trx('organisations').where({ id: org }).first('id'))) continue;
			const have = new Set(
				(await trx('materials').where({ organisation_id: org }).select('code')).map((r) => r.code)
			);
			for (const r of rows) {
				if (have.has(r.code)) continue;
				const [m] = await trx('materials').insert({ organisation_id: org, code: r.code }).returning('id');
				/** @type {Record<string, unknown>} */
				const rev = {
					organisation_id: org,
					material_id: m.id,
					revision: 1,
					name: r.name,
					manufacturer: r.manufacturer || 'generic',
					category: r.category,
					status: 'unverified',
					indicative: r.indicative === 'yes'
				};
				for (const c of NUMBERS) rev[c] = r[c] === '' || r[c] === undefined ? null : Number(r[c]);
				for (const c of TEXTS) rev[c] = r[c] === '' || r[c] === undefined ? null : r[c];
				const [written] = await trx('material_revisions').insert(rev).returning('id');
				await trx('materials').where({ id: m.id }).update({ current_revision_id: written.id });
			}
		}
	});
}
