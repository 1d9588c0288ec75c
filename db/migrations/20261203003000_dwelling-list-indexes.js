/**
 * Indexes for the dwellings list at scale (measured by bench/scale.bench.ts with 100k dwellings):
 * 1. `dwellings_search_trgm`: trigram GIN over the four searched columns, so `ILIKE '%…%'` on reference,
 *    address, programme and client name is an index scan instead of reading every row (pg_trgm is a
 *    trusted extension since PostgreSQL 13: the database's owner may create it).
 * 2. `dwellings_org_updated_ref` and `dwellings_org_address_ref`: the default order (latest change
 *    first, then reference) and the order by address, each within an organisation, so a page is read
 *    in order instead of sorting every row.
 * 3. `elements_build_up_layers` goes: `elements_layers_path` (20261202006000) is the same index, and
 *    every element write kept both.
 */
/** @param {import('knex').Knex} knex */
export async function up(knex) {
	await knex.raw('CREATE EXTENSION IF NOT EXISTS pg_trgm');
	await knex.raw(`CREATE INDEX dwellings_search_trgm ON dwellings USING gin
		(reference gin_trgm_ops, address gin_trgm_ops, programme gin_trgm_ops, client_name gin_trgm_ops)`);
	await knex.raw(
		'CREATE INDEX dwellings_org_updated_ref ON dwellings (organisation_id, updated_at DESC NULLS LAST, reference)'
	);
	await knex.raw('CREATE INDEX dwellings_org_address_ref ON dwellings (organisation_id, address, reference)');
	await knex.raw('DROP INDEX IF EXISTS elements_build_up_layers');
}

/** @param {import('knex').Knex} knex */
export async function down(knex) {
	await knex.raw('DROP INDEX IF EXISTS dwellings_search_trgm');
	await knex.raw('DROP INDEX IF EXISTS dwellings_org_updated_ref');
	await knex.raw('DROP INDEX IF EXISTS dwellings_org_address_ref');
	await knex.raw(
		`CREATE INDEX IF NOT EXISTS elements_build_up_layers ON elements USING gin ((build_up -> 'layers') jsonb_path_ops)`
	);
}
