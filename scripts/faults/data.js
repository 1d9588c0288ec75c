// The data the fault scenarios work on, in an organisation of their own: members signed in through
// session rows (as Auth.js writes them), a climate and limit table, bulk dwellings with issued reports
// for the recomputes, and library CSV files. Invented, for these runs only.
import knex from 'knex';
import { randomBytes } from 'node:crypto';
import { env, waitFor } from './env.js';

/** The scenarios' own connection, as the app's role (the one Envelo itself has). */
export const db = knex({ client: 'pg', connection: env.databaseUrl, pool: { min: 0, max: 4 } });

const MONTHS = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
})); // invented

/** A member of the organisation with a session of four hours: { id, email, cookie }. */
export async function addMember(orgId, tag, role) {
	const email = `faults-${tag}-${role}-${randomBytes(3).toString('hex')}@faults.example.test`;
	const [user] = await db('users')
		.insert({ email, name: `Faults ${role} ${tag}`, registration_number: `FLT-${tag}` })
		.returning('id');
	await db('memberships').insert({ organisation_id: orgId, user_id: user.id, role });
	const token = randomBytes(24).toString('hex');
	await db('sessions').insert({
		userId: user.id,
		sessionToken: token,
		expires: new Date(Date.now() + 4 * 3600_000)
	});
	return { id: user.id, email, cookie: `authjs.session-token=${token}` };
}

/** A fresh organisation with an admin, an assessor and a supervisor, a climate and a default limit table. */
export async function makeOrganisation(tag) {
	const [org] = await db('organisations')
		.insert({ name: `Faults Organisation ${tag}`, slug: `faults-${tag}-${randomBytes(3).toString('hex')}` })
		.returning('id');
	const [climate] = await db('climates')
		.insert({
			organisation_id: org.id,
			name: 'Faults climate',
			source: 'invented',
			illustrative: true,
			months: JSON.stringify(MONTHS)
		})
		.returning('id');
	await db('limit_tables').insert({
		organisation_id: org.id,
		name: 'Faults limits',
		edition: '1',
		is_default: true,
		limits: JSON.stringify({ 'external-wall': 0.3, 'flat-roof': 0.2 })
	});
	return {
		orgId: org.id,
		climateId: climate.id,
		admin: await addMember(org.id, tag, 'admin'),
		assessor: await addMember(org.id, tag, 'assessor'),
		supervisor: await addMember(org.id, tag, 'supervisor')
	};
}

/** A wall an element body carries (invented values of the usual order). */
export const wallBody = (name) => ({
	name,
	kind: 'external-wall',
	area: 12,
	buildUp: {
		layers: [
			{ name: 'Plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
			{ name: 'Wool', thicknessMm: 100, lambda: 0.035, mu: 1 },
			{ name: 'Brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
		]
	},
	internal: { temperature: 20, humidityClass: 3 }
});

/**
 * `n` issued dwellings of `programme`, three elements each (the insulation's thickness varies by
 * dwelling, so the recompute cannot reuse one result), each with an issued dwelling report whose
 * snapshot holds no elements: written in three statements. Returns their ids.
 */
export async function seedIssuedDwellings(o, programme, n) {
	const prefix = `${programme.toUpperCase()}-`;
	await db.raw(
		`INSERT INTO dwellings (organisation_id, reference, address, assessor_id, status, climate_id, programme)
		 SELECT ?, ? || lpad(i::text, 5, '0'), 'Faults Row', ?, 'issued', ?, ? FROM generate_series(1, ?) i`,
		[o.orgId, prefix, o.assessor.id, o.climateId, programme, n]
	);
	await db.raw(
		`INSERT INTO elements (organisation_id, dwelling_id, position, name, kind, area, heat_flow, build_up, internal)
		 SELECT d.organisation_id, d.id, p, 'Element ' || p, (ARRAY['external-wall','external-wall','flat-roof'])[p + 1], 10 + p,
		   (ARRAY['horizontal','horizontal','upward'])[p + 1],
		   jsonb_build_object('layers', jsonb_build_array(
		     jsonb_build_object('name', 'Plaster', 'thicknessMm', 13, 'lambda', 0.4, 'mu', 10),
		     jsonb_build_object('name', 'Wool', 'thicknessMm', 50 + (substring(d.reference from '[0-9]+$')::int * 7 + p) % 300, 'lambda', 0.035, 'mu', 1),
		     jsonb_build_object('name', 'Brick', 'thicknessMm', 102, 'lambda', 0.77, 'mu', 10))),
		   '{"temperature": 20, "humidityClass": 3}'::jsonb
		 FROM dwellings d CROSS JOIN generate_series(0, 2) p WHERE d.organisation_id = ? AND d.programme = ?`,
		[o.orgId, programme]
	);
	await db.raw(
		`INSERT INTO reports (organisation_id, number, revision, scope, dwelling_id, snapshot, engine_version,
		   verification_code, sha256, pdf, issued_by)
		 SELECT d.organisation_id, 'R-' || d.reference, 1, 'dwelling', d.id,
		   jsonb_build_object('dwelling', jsonb_build_object('id', d.id), 'elements', '[]'::jsonb), 'faults',
		   md5(random()::text || d.id::text), md5(d.id::text), convert_to('%PDF faults', 'UTF8'), ?
		 FROM dwellings d WHERE d.organisation_id = ? AND d.programme = ?`,
		[o.assessor.id, o.orgId, programme]
	);
	const rows = await db('dwellings').where({ organisation_id: o.orgId, programme }).select('id');
	return rows.map((r) => r.id);
}

const HEADER =
	'code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes';

/** A library CSV of `n` new insulation boards whose codes start with `prefix`. */
export function libraryCsv(prefix, n) {
	const lines = [HEADER];
	for (let i = 0; i < n; i++) {
		const lambda = (0.03 + (i % 20) / 1000).toFixed(3);
		lines.push(
			`${prefix}${String(i).padStart(6, '0')},"Board ${i}, rigid",Faults Products,insulation,${lambda},declared,,${1 + (i % 60)},,,${20 + (i % 50)},1030,20,300,Declaration F-${i},2025-01-01,2030-01-01,no,`
		);
	}
	return lines.join('\n') + '\n';
}

/** How many materials of the organisation have codes starting with `prefix`. */
export async function countMaterials(orgId, prefix) {
	const [{ n }] = await db('materials')
		.where({ organisation_id: orgId })
		.andWhere('code', 'like', `${prefix}%`)
		.count({ n: '*' });
	return Number(n);
}

/** Wait until PostgreSQL has ended every session of a killed Envelo process (its transactions rolled back). */
export async function sessionsGone(app) {
	const name = `envelo-${app.name}`;
	await waitFor(`the database sessions of ${name} to end`, async () => {
		const { rows } = await db.raw(
			'SELECT count(*)::int AS n FROM pg_stat_activity WHERE application_name = ?',
			[name]
		);
		return rows[0].n === 0;
	});
}
