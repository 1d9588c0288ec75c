// Demo organisations and people, an invented scenario: Northfield Retrofit Partnership assesses homes in
// an imagined retrofit programme; Harbourline Surveys is a second firm that exists to prove isolation.
// Idempotent: a second run keeps what is there.

export const DEMO = {
	northfield: {
		id: '00000000-0000-4000-8000-000000000001',
		name: 'Northfield Retrofit Partnership',
		slug: 'northfield-retrofit'
	},
	harbourline: {
		id: '00000000-0000-4000-8000-000000000002',
		name: 'Harbourline Surveys',
		slug: 'harbourline-surveys'
	},
	people: [
		{
			id: '00000000-0000-4000-8000-000000000101',
			org: 'northfield',
			role: 'admin',
			name: 'Ada Mensah',
			email: 'ada.mensah@northfield-retrofit.example.test',
			reg: null
		},
		{
			id: '00000000-0000-4000-8000-000000000102',
			org: 'northfield',
			role: 'assessor',
			name: 'Ben Okafor',
			email: 'ben.okafor@northfield-retrofit.example.test',
			reg: 'NRP-A-0142 (demo)'
		},
		{
			id: '00000000-0000-4000-8000-000000000103',
			org: 'northfield',
			role: 'assessor',
			name: 'Carla Reyes',
			email: 'carla.reyes@northfield-retrofit.example.test',
			reg: 'NRP-A-0187 (demo)'
		},
		{
			id: '00000000-0000-4000-8000-000000000104',
			org: 'northfield',
			role: 'supervisor',
			name: 'Dara Quinn',
			email: 'dara.quinn@northfield-retrofit.example.test',
			reg: null
		},
		{
			id: '00000000-0000-4000-8000-000000000201',
			org: 'harbourline',
			role: 'admin',
			name: 'Eli Brandt',
			email: 'eli.brandt@harbourline-surveys.example.test',
			reg: null
		},
		{
			id: '00000000-0000-4000-8000-000000000202',
			org: 'harbourline',
			role: 'assessor',
			name: 'Fern Oduya',
			email: 'fern.oduya@harbourline-surveys.example.test',
			reg: 'HLS-7781 (demo)'
		}
	]
};

/** @param {import('knex').Knex} knex */
export async function seed(knex) {
	await knex.transaction(async (trx) => {
		for (const o of [DEMO.northfield, DEMO.harbourline]) {
			await trx('organisations').insert(o).onConflict('id').ignore();
		}
		for (const p of DEMO.people) {
			await trx('users')
				.insert({ id: p.id, name: p.name, email: p.email, registration_number: p.reg })
				.onConflict('id')
				.ignore();
			await trx('memberships')
				.insert({
					organisation_id: p.org === 'northfield' ? DEMO.northfield.id : DEMO.harbourline.id,
					user_id: p.id,
					role: p.role
				})
				.onConflict(['user_id'])
				.ignore();
		}
	});
}
