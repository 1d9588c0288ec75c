/**
 * The vocabulary of junctions (linear thermal bridges) shared by the pages, the API, the server and
 * the database's CHECK constraints: junction types, the dimension systems a ψ-value refers to
 * (ISO 13789: internal, overall internal, external), and where a ψ-value comes from.
 */
import type { ElementKind } from '$lib/dwellings/kinds';

export const JUNCTION_TYPES = [
	'external-corner',
	'internal-corner',
	'ground-floor',
	'intermediate-floor',
	'eaves',
	'flat-roof',
	'window-head',
	'window-jamb',
	'window-sill',
	'party-wall',
	'other'
] as const;
export type JunctionType = (typeof JUNCTION_TYPES)[number];

export const JUNCTION_TYPE_LABELS: Record<JunctionType, string> = {
	'external-corner': 'External corner (walls)',
	'internal-corner': 'Internal corner (walls)',
	'ground-floor': 'Wall – ground floor',
	'intermediate-floor': 'Wall – intermediate floor',
	eaves: 'Wall – pitched roof at the eaves (insulated ceiling)',
	'flat-roof': 'Wall – flat roof',
	'window-head': 'Window head',
	'window-jamb': 'Window jamb',
	'window-sill': 'Window sill',
	'party-wall': 'Party wall – external wall',
	other: 'Other (free-form model)'
};

/** Lengths of the flanking elements, and so ψ, are measured in one of these (ISO 13789). */
export const DIMENSION_SYSTEMS = ['internal', 'overall-internal', 'external'] as const;
export type DimensionSystem = (typeof DIMENSION_SYSTEMS)[number];

export const DIMENSION_SYSTEM_LABELS: Record<DimensionSystem, string> = {
	internal: 'internal dimensions',
	'overall-internal': 'overall internal dimensions',
	external: 'external dimensions'
};

export const PSI_SOURCES = ['calculated', 'entered'] as const;
export type PsiSource = (typeof PSI_SOURCES)[number];

/** A role an element plays in a junction type, with the element kinds that may play it. */
export type ElementRole = {
	key: 'a' | 'b';
	label: string;
	kinds: readonly ElementKind[];
	optional?: boolean;
};

const WALLS: readonly ElementKind[] = ['external-wall'];

/** The elements the person picks for each type built from the dwelling's elements ('other' is free-form). */
export const JUNCTION_ROLES: Record<Exclude<JunctionType, 'other'>, readonly ElementRole[]> = {
	'external-corner': [
		{ key: 'a', label: 'First wall', kinds: WALLS },
		{ key: 'b', label: 'Second wall (the first again if left empty)', kinds: WALLS, optional: true }
	],
	'internal-corner': [
		{ key: 'a', label: 'First wall', kinds: WALLS },
		{ key: 'b', label: 'Second wall (the first again if left empty)', kinds: WALLS, optional: true }
	],
	'ground-floor': [
		{ key: 'a', label: 'Wall', kinds: WALLS },
		{ key: 'b', label: 'Ground floor', kinds: ['ground-floor'] }
	],
	'intermediate-floor': [{ key: 'a', label: 'Wall', kinds: WALLS }],
	eaves: [
		{ key: 'a', label: 'Wall', kinds: WALLS },
		{ key: 'b', label: 'Ceiling under the roof space', kinds: ['pitched-roof-ceiling'] }
	],
	'flat-roof': [
		{ key: 'a', label: 'Wall', kinds: WALLS },
		{ key: 'b', label: 'Flat roof', kinds: ['flat-roof'] }
	],
	'window-head': [
		{ key: 'a', label: 'Wall', kinds: WALLS },
		{
			key: 'b',
			label: 'Window (its U sets the panel; 1.4 W/(m²·K) if left empty)',
			kinds: ['window'],
			optional: true
		}
	],
	'window-jamb': [
		{ key: 'a', label: 'Wall', kinds: WALLS },
		{
			key: 'b',
			label: 'Window (its U sets the panel; 1.4 W/(m²·K) if left empty)',
			kinds: ['window'],
			optional: true
		}
	],
	'window-sill': [
		{ key: 'a', label: 'Wall', kinds: WALLS },
		{
			key: 'b',
			label: 'Window (its U sets the panel; 1.4 W/(m²·K) if left empty)',
			kinds: ['window'],
			optional: true
		}
	],
	'party-wall': [
		{ key: 'a', label: 'External wall', kinds: WALLS },
		{ key: 'b', label: 'Party wall', kinds: ['party-wall'] }
	]
};

/** The fRsi figure dwellings are commonly held to when no national value applies. */
export const FRSI_RULE_OF_THUMB = 0.75; // common practice, no source
