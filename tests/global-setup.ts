import knex from 'knex';
import config from '../knexfile.js';

/**
 * Server suites run against a real PostgreSQL: the test command starts a throwaway cluster and sets
 * TEST_DATABASE_URL. Here the schema is rebuilt from the migrations once per run.
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
	const k = knex({ ...config, connection: url });
	try {
		await k.raw('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
		await k.migrate.latest();
	} finally {
		await k.destroy();
	}
}
