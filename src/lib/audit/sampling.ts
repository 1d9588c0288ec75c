import seedrandom from 'seedrandom';

/**
 * Reproducible sampling of a batch. The population is sorted by id before shuffling, so the same seed
 * picks the same dwellings whatever order the database returns them in; the seed is stored with the batch.
 */
export type SamplingRule =
	| { rule: 'all'; includeFlagged: boolean }
	| { rule: 'random'; percent: number; minimumPerAssessor: number; includeFlagged: boolean };

export type Candidate = { id: string; assessorId: string | null; assessorName?: string | null };
export type Pick = { id: string; reason: string };

/** Fisher–Yates shuffle driven by a seeded generator (ARC4 from the seedrandom package). */
export function seededShuffle<T>(items: readonly T[], seed: string): T[] {
	const rng = seedrandom(seed);
	const out = items.slice();
	for (let i = out.length - 1; i > 0; i--) {
		const j = Math.floor(rng() * (i + 1));
		[out[i], out[j]] = [out[j], out[i]];
	}
	return out;
}

export function newSeed(): string {
	// Not security-relevant: the seed only has to be recorded, not secret.
	return Math.random().toString(36).slice(2, 10);
}

/**
 * Pick dwellings by the rule. `all` takes everyone; `random` takes ceil(percent % of the population) in
 * seeded order, then tops up each assessor to the minimum from their own dwellings (still in seeded
 * order). Each pick says why it was made. Flagged dwellings are added later, by the recompute.
 */
export function sampleDwellings(
	population: readonly Candidate[],
	sampling: SamplingRule,
	seed: string
): Pick[] {
	const sorted = population.slice().sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
	if (sampling.rule === 'all') return sorted.map((c) => ({ id: c.id, reason: 'all dwellings of the batch' }));
	const order = seededShuffle(sorted, seed);
	const count = Math.min(order.length, Math.ceil((sampling.percent / 100) * order.length));
	const picked = new Map<string, Pick>();
	for (const c of order.slice(0, count)) {
		picked.set(c.id, { id: c.id, reason: `random sample of ${sampling.percent} % (seed ${seed})` });
	}
	if (sampling.minimumPerAssessor > 0) {
		const perAssessor = new Map<string, number>();
		for (const c of order)
			if (picked.has(c.id))
				perAssessor.set(c.assessorId ?? '', (perAssessor.get(c.assessorId ?? '') ?? 0) + 1);
		for (const c of order) {
			if (picked.has(c.id)) continue;
			const key = c.assessorId ?? '';
			const n = perAssessor.get(key) ?? 0;
			if (n >= sampling.minimumPerAssessor) continue;
			perAssessor.set(key, n + 1);
			const who = c.assessorName ?? (c.assessorId ? 'this assessor' : 'dwellings without an assessor');
			picked.set(c.id, {
				id: c.id,
				reason: `minimum of ${sampling.minimumPerAssessor} per assessor (${who}; seed ${seed})`
			});
		}
	}
	// Keep the seeded order: it is the order a reviewer meets them in.
	return order.filter((c) => picked.has(c.id)).map((c) => picked.get(c.id)!);
}
