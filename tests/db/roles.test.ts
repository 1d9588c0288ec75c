// The role Envelo connects as (migration 20261202004000_app-role-privileges; the roles are made by
// docker-free-start.sh). The test command gives the suites the app's connection (TEST_DATABASE_URL): from it,
// the append-only guarantees of reports and activity_log cannot be switched off, their rows cannot be
// changed or removed, and the schema cannot be changed, while the app's ordinary writes work.
// Sources: PostgreSQL 15 documentation — session_replication_role may be set by superusers only
// (§20.11.1 Statement Behavior; "superuser only" from memory); ALTER TABLE … DISABLE TRIGGER, DROP TRIGGER and
// CREATE OR REPLACE FUNCTION require owning the table or function (their reference pages); the privileges
// each command needs (§5.7 Privileges); SQLSTATE 42501 is insufficient_privilege (Appendix A). The rows are
// invented.
import { describe, it, expect, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { hasDatabase, makeMember, makeOrganisation, tdb } from '../factories';
import { issueReport, makeDwelling } from '../factories-audit';

const INSUFFICIENT_PRIVILEGE = '42501';
const APPEND_ONLY = ['reports', 'activity_log'] as const;

/** Thrown to roll back a statement that went through, so that no probe is ever committed. */
const ALLOWED = new Error('allowed');

/** The statement, alone in a transaction, is refused for lack of privilege with this message. */
async function refused(sql: string, message: RegExp) {
	const error = await tdb()
		.transaction(async (trx) => {
			await trx.raw(sql);
			throw ALLOWED;
		})
		.catch((e: unknown) => e);
	expect(error, `${sql} was allowed`).not.toBe(ALLOWED);
	expect(error).toMatchObject({ code: INSUFFICIENT_PRIVILEGE });
	expect((error as Error).message).toMatch(message);
}

describe.skipIf(!hasDatabase)("the app's database role", async () => {
	const { db, authPool } = await import('../../src/lib/server/db');
	const { logActivity } = await import('../../src/lib/server/activity');
	afterAll(async () => {
		await db.destroy();
		await authPool.end();
	});

	/** An organisation with an issued report and a logged action, as the app leaves them. */
	async function world() {
		const org = await makeOrganisation();
		const member = await makeMember(org.id, 'assessor');
		const dwelling = await makeDwelling(org.id, member.id);
		const reportId = await issueReport(org.id, dwelling.id, member.id);
		const entityId = randomUUID();
		await logActivity({
			organisationId: org.id,
			userId: member.id,
			action: 'check',
			entity: 'role-test',
			entityId,
			details: { invented: true }
		});
		const logged = await tdb()('activity_log').where({ entity_id: entityId }).first();
		return { reportId, logId: Number(logged.id) };
	}

	it('is no superuser, may create no roles or databases, bypasses no row security, and owns nothing', async () => {
		const me = (
			await tdb().raw(
				`SELECT rolsuper, rolcreaterole, rolcreatedb, rolreplication, rolbypassrls
				 FROM pg_roles WHERE rolname = current_user`
			)
		).rows[0];
		expect(me).toEqual({
			rolsuper: false,
			rolcreaterole: false,
			rolcreatedb: false,
			rolreplication: false,
			rolbypassrls: false
		});
		const owned = (
			await tdb().raw(
				`SELECT ((SELECT count(*) FROM pg_class WHERE relowner = r.oid)
				      + (SELECT count(*) FROM pg_namespace WHERE nspowner = r.oid)
				      + (SELECT count(*) FROM pg_proc WHERE proowner = r.oid)
				      + (SELECT count(*) FROM pg_type WHERE typowner = r.oid))::int AS n,
				        (SELECT count(*) FROM pg_auth_members WHERE member = r.oid)::int AS memberships
				 FROM pg_roles r WHERE r.rolname = current_user`
			)
		).rows[0];
		expect(owned).toEqual({ n: 0, memberships: 0 });
	});

	it('cannot switch off the triggers: session_replication_role, DISABLE TRIGGER, DROP TRIGGER, a new trigger function', async () => {
		const w = await world();
		await refused(
			'SET session_replication_role = replica',
			/permission denied to set parameter "session_replication_role"/
		);
		// The way round inside a transaction: the SET is refused, so the UPDATE never runs.
		await refused(
			`SET LOCAL session_replication_role = replica; UPDATE reports SET sha256 = 'x' WHERE id = '${w.reportId}'`,
			/permission denied to set parameter "session_replication_role"/
		);
		for (const table of APPEND_ONLY) {
			await refused(
				`ALTER TABLE ${table} DISABLE TRIGGER ALL`,
				new RegExp(`must be owner of table ${table}`)
			);
			await refused(
				`ALTER TABLE ${table} DISABLE TRIGGER USER`,
				new RegExp(`must be owner of table ${table}`)
			);
		}
		await refused('DROP TRIGGER reports_immutable ON reports', /must be owner of (table|relation) reports/);
		await refused(
			'DROP TRIGGER activity_log_append_only ON activity_log',
			/must be owner of (table|relation) activity_log/
		);
		await refused(
			`CREATE OR REPLACE FUNCTION refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$ BEGIN RETURN OLD; END $$`,
			/must be owner of function refuse_change|permission denied for schema public/
		);
		const owner = (await tdb().raw(`SELECT tableowner FROM pg_tables WHERE tablename = 'reports'`)).rows[0]
			.tableowner as string;
		await refused(`SET ROLE "${owner}"`, /permission denied to set role/);
		expect((await tdb()('reports').where({ id: w.reportId }).first('sha256')).sha256).not.toBe('x');
	});

	it('may only INSERT and SELECT on reports and activity_log: UPDATE, DELETE and TRUNCATE are refused by privilege', async () => {
		const w = await world();
		for (const table of APPEND_ONLY) {
			const privileges = (
				await tdb().raw(
					`SELECT p, has_table_privilege(?, p) AS granted
					 FROM unnest(ARRAY['SELECT', 'INSERT', 'UPDATE', 'DELETE', 'TRUNCATE', 'REFERENCES', 'TRIGGER']) AS p`,
					[table]
				)
			).rows as { p: string; granted: boolean }[];
			expect(Object.fromEntries(privileges.map((r) => [r.p, r.granted]))).toEqual({
				SELECT: true,
				INSERT: true,
				UPDATE: false,
				DELETE: false,
				TRUNCATE: false,
				REFERENCES: false,
				TRIGGER: false
			});
		}
		const denied = (table: string) => new RegExp(`permission denied for table ${table}`);
		await refused(`UPDATE reports SET sha256 = 'x' WHERE id = '${w.reportId}'`, denied('reports'));
		await refused(`DELETE FROM reports WHERE id = '${w.reportId}'`, denied('reports'));
		await refused('TRUNCATE reports', denied('reports'));
		await refused(`UPDATE activity_log SET action = 'x' WHERE id = ${w.logId}`, denied('activity_log'));
		await refused(`DELETE FROM activity_log WHERE id = ${w.logId}`, denied('activity_log'));
		await refused('TRUNCATE activity_log', denied('activity_log'));
		expect(await tdb()('reports').where({ id: w.reportId }).first('id')).toBeTruthy();
		expect((await tdb()('activity_log').where({ id: w.logId }).first()).action).toBe('check');
	});

	it('cannot change the schema: no new table, no new column, no new schema', async () => {
		await refused('CREATE TABLE role_probe (id int)', /permission denied for schema public/);
		await refused('ALTER TABLE dwellings ADD COLUMN role_probe int', /must be owner of table dwellings/);
		await refused('CREATE SCHEMA role_probe', /permission denied for database/);
	});

	it("does the app's ordinary writes: an activity row in a transaction, a report, a dwelling changed and removed", async () => {
		const org = await makeOrganisation();
		const member = await makeMember(org.id, 'assessor');
		const entityId = randomUUID();
		await db.transaction((trx) =>
			logActivity(
				{
					organisationId: org.id,
					userId: member.id,
					action: 'create',
					entity: 'role-test',
					entityId,
					details: { step: 1 }
				},
				trx
			)
		);
		const row = await tdb()('activity_log').where({ entity_id: entityId }).first();
		expect(row).toMatchObject({ organisation_id: org.id, action: 'create', details: { step: 1 } });

		const dwelling = await makeDwelling(org.id, member.id);
		const reportId = await issueReport(org.id, dwelling.id, member.id);
		expect((await tdb()('reports').where({ id: reportId }).first('organisation_id')).organisation_id).toBe(
			org.id
		);
		const other = await makeDwelling(org.id, member.id);
		await db('dwellings').where({ id: other.id }).update({ address: '2 Changed Row' });
		expect((await tdb()('dwellings').where({ id: other.id }).first('address')).address).toBe('2 Changed Row');
		await db('dwellings').where({ id: other.id }).delete();
		expect(await tdb()('dwellings').where({ id: other.id }).first()).toBeUndefined();
	});
});
