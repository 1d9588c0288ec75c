/**
 * A junction's stored fields, the one shape that the editor, the issued report's snapshot, the change
 * list and the audit all start from; each adds what it keeps beside them (its model, ψ, result, version).
 */
import type { JunctionDetails } from './schema';
import type { DimensionSystem, JunctionType, PsiSource } from './kinds';

export type JunctionFields = {
	id: string;
	name: string;
	type: JunctionType;
	/** length in the dwelling, m */
	lengthM: number;
	source: PsiSource;
	dimensionSystem: DimensionSystem;
	/** an entered ψ, W/(m·K) (null when calculated) */
	psiEntered: number | null;
	/** where an entered ψ comes from */
	psiSource: string | null;
	/** the builder's choices (null for an entered ψ or a free-form model) */
	details: JunctionDetails | null;
};
