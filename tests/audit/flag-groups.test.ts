import { describe, expect, it } from 'vitest';
import { FLAG_CODES, type Flag } from '../../src/lib/audit/flags';
import {
	codesOf,
	countByGroup,
	FLAG_GROUP_OF,
	FLAG_GROUPS,
	groupFlags,
	groupOf,
	matchesFlag
} from '../../src/lib/audit/flag-groups';

// Envelo's own grouping of its audit flags (no source: the kinds are the product's choice).
describe('audit flag groups', () => {
	it('puts every flag code in exactly one group, and every group has codes', () => {
		for (const c of FLAG_CODES) expect(FLAG_GROUPS).toContain(FLAG_GROUP_OF[c]);
		const all = FLAG_GROUPS.flatMap(codesOf);
		expect(all.sort()).toEqual([...FLAG_CODES].sort());
		for (const g of FLAG_GROUPS) expect(codesOf(g).length).toBeGreaterThan(0);
	});

	it('groups in a fixed order, most severe first within a group, empty groups left out', () => {
		const flags: Flag[] = [
			{ code: 'material-unverified', severity: 'low', reason: 'a' },
			{ code: 'u-over-limit', severity: 'medium', reason: 'b' },
			{ code: 'surface-mould-risk', severity: 'high', reason: 'c' },
			{ code: 'generic-lambda', severity: 'medium', reason: 'd' }
		];
		const g = groupFlags(flags);
		expect(g.map((x) => x.group)).toEqual(['limits', 'library']);
		expect(g[0].flags.map((f) => f.reason)).toEqual(['c', 'b']);
		expect(g[1].flags.map((f) => f.reason)).toEqual(['d', 'a']);
	});

	it('filters by group, code and severity together', () => {
		const flags: Pick<Flag, 'code' | 'severity'>[] = [
			{ code: 'u-over-limit', severity: 'high' },
			{ code: 'u-over-limit', severity: 'low' },
			{ code: 'stale-report', severity: 'high' }
		];
		expect(groupFlags(flags, { group: 'limits' }).flatMap((g) => g.flags)).toHaveLength(2);
		expect(groupFlags(flags, { severity: 'high' }).flatMap((g) => g.flags)).toHaveLength(2);
		expect(groupFlags(flags, { code: 'stale-report' }).map((g) => g.group)).toEqual(['record']);
		expect(groupFlags(flags, { group: 'library' })).toEqual([]);
		expect(matchesFlag(flags[0], {})).toBe(true);
		expect(matchesFlag(flags[0], { group: '', code: '', severity: '' })).toBe(true);
	});

	it('counts by group; an unknown stored code counts as an input to check', () => {
		expect(groupOf('some-retired-code')).toBe('inputs');
		expect(countByGroup([{ code: 'u-over-limit' }, { code: 'some-retired-code' } as never])).toEqual({
			limits: 1,
			record: 0,
			library: 0,
			inputs: 1
		});
	});
});
