// The database's own checks on junctions (migration 20261202007000_junctions): the types, sources and
// dimension systems the code has (src/lib/junctions/kinds.ts), a positive finite length, an entered ψ
// with its source, a calculated one with its model, and no junction pointing at another
// organisation's dwelling. Rules of the product (common practice, no source); rows inserted directly.
import { describe, it, expect } from 'vitest';
import { hasDatabase, makeOrganisation, tdb } from '../../factories';
import { DIMENSION_SYSTEMS, JUNCTION_TYPES, PSI_SOURCES } from '../../../src/lib/junctions/kinds';

const CHECK = '23514';
const FOREIGN_KEY = '23503';

describe.skipIf(!hasDatabase)('junction constraints', () => {
	async function dwelling() {
		const org = await makeOrganisation();
		const [d] = await tdb()('dwellings')
			.insert({ organisation_id: org.id, reference: `C-${Math.random().toString(36).slice(2, 8)}` })
			.returning('id');
		return { org: org.id, dwelling: d.id as string };
	}
	const entered = (o: { org: string; dwelling: string }, over: Record<string, unknown> = {}) =>
		tdb()('junctions').insert({
			organisation_id: o.org,
			dwelling_id: o.dwelling,
			name: 'J',
			type: 'external-corner',
			length_m: 5,
			source: 'entered',
			dimension_system: 'external',
			psi_entered: 0.1,
			psi_source: 'A table',
			...over
		});

	it('accepts every value of the code’s vocabularies and refuses others', async () => {
		const o = await dwelling();
		for (const type of JUNCTION_TYPES) await entered(o, { type });
		for (const dimension_system of DIMENSION_SYSTEMS) await entered(o, { dimension_system });
		expect(PSI_SOURCES).toEqual(['calculated', 'entered']);
		await expect(entered(o, { type: 'balcony' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_type_check'
		});
		await expect(entered(o, { source: 'guessed' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_source_check'
		});
		await expect(entered(o, { dimension_system: 'metric' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_dimension_system_check'
		});
	});

	it('refuses a length that is not a positive finite number, and an entered ψ without its source', async () => {
		const o = await dwelling();
		for (const length_m of [0, -1, 'NaN', 'Infinity'])
			await expect(entered(o, { length_m })).rejects.toMatchObject({
				code: CHECK,
				constraint: 'junctions_length_m_check'
			});
		await expect(entered(o, { psi_source: '  ' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_entered_check'
		});
		await expect(entered(o, { psi_entered: null })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_entered_check'
		});
		await expect(entered(o, { psi_entered: 'NaN' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_entered_check'
		});
		await expect(entered(o, { source: 'calculated' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_calculated_check'
		});
		await expect(entered(o, { last_result: '{}' })).rejects.toMatchObject({
			code: CHECK,
			constraint: 'junctions_result_engine_check'
		});
	});

	it('refuses a junction of one organisation on another’s dwelling, and goes with its dwelling', async () => {
		const a = await dwelling();
		const b = await dwelling();
		await expect(entered({ org: a.org, dwelling: b.dwelling })).rejects.toMatchObject({
			code: FOREIGN_KEY,
			constraint: 'junctions_dwelling_foreign'
		});
		await entered(a);
		await tdb()('dwellings').where({ id: a.dwelling }).delete();
		expect(await tdb()('junctions').where({ dwelling_id: a.dwelling })).toEqual([]);
	});
});
