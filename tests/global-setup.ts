import knex from 'knex';
import config from '../knexfile.js';

/**
 * Server suites run against a real PostgreSQL: the test command starts a throwaway cluster and sets
 * TEST_DATABASE_URL (the app's role, which the suites and the services under test connect as) and
 * TEST_DATABASE_OWNER_URL (the schema's owner). Here the schema is rebuilt from the migrations once per
 * run, as the owner.
 */
export default async function setup() {
	const url = process.env.TEST_DATABASE_URL;
	if (!url) {
		console.warn(
			'[tests] TEST_DATABASE_URL is not set: server suites will be skipped (run ./docker-free-start.sh test)'
		);
		return;
	}
	process.env.DATABASE_URL = url;
	const ownerUrl = process.env.TEST_DATABASE_OWNER_URL || url;
	// The suites get the app's connection only.
	delete process.env.TEST_DATABASE_OWNER_URL;
	delete process.env.DATABASE_OWNER_URL;
	const k = knex({ ...config, connection: ownerUrl });
	try {
		await k.raw('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
		await k.migrate.latest();
	} finally {
		await k.destroy();
	}
}
