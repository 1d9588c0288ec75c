// How the audit compares stored values: key order does not matter, floating-point noise is not a
// difference (1e-9, or 1e-9 of the larger value over 1: common practice, no source).
import { describe, it, expect } from 'vitest';
import { canonical, different } from '../../src/lib/audit/compare';

describe('canonical', () => {
	it('ignores key order and undefined keys, keeps array order', () => {
		expect(canonical({ b: 1, a: { d: [2, 1], c: undefined } })).toBe(canonical({ a: { d: [2, 1] }, b: 1 }));
		expect(canonical({ a: [1, 2] })).not.toBe(canonical({ a: [2, 1] }));
		expect(canonical(undefined)).toBe('null');
	});
});

describe('different', () => {
	it('tells changed numbers from noise, and a missing number differs from nothing', () => {
		expect(different(20, 21)).toBe(true);
		expect(different(20, 20 + 1e-12)).toBe(false);
		expect(different(1e6, 1e6 + 1e-4)).toBe(false); // 1e-10 of the value
		expect(different(null, 3)).toBe(false);
		expect(different(3, undefined)).toBe(false);
	});
});
