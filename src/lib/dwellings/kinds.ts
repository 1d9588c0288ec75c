import type { HeatFlow } from '$lib/physics';

/** Kinds of element a dwelling has, with the heat-flow direction each implies by default (ISO 6946 §6.8, from memory:
 * walls horizontal, roofs and ceilings upward, floors downward, for heat flowing out of the dwelling in winter). */
export const ELEMENT_KINDS = [
	'external-wall',
	'party-wall',
	'pitched-roof-ceiling',
	'pitched-roof-rafters',
	'flat-roof',
	'ground-floor',
	'exposed-floor',
	'window',
	'door'
] as const;
export type ElementKind = (typeof ELEMENT_KINDS)[number];

export const ELEMENT_KIND_LABELS: Record<ElementKind, string> = {
	'external-wall': 'External wall',
	'party-wall': 'Party wall',
	'pitched-roof-ceiling': 'Pitched roof, insulated at ceiling',
	'pitched-roof-rafters': 'Pitched roof, insulated at rafters',
	'flat-roof': 'Flat roof',
	'ground-floor': 'Ground floor',
	'exposed-floor': 'Exposed floor',
	window: 'Window',
	door: 'Door'
};

export const DEFAULT_HEAT_FLOW: Record<ElementKind, HeatFlow> = {
	'external-wall': 'horizontal',
	'party-wall': 'horizontal',
	'pitched-roof-ceiling': 'upward',
	'pitched-roof-rafters': 'upward',
	'flat-roof': 'upward',
	'ground-floor': 'downward',
	'exposed-floor': 'downward',
	window: 'horizontal',
	door: 'horizontal'
};

/** Windows and doors take a given U-value with its source instead of a build-up. */
export const GIVEN_U_KINDS: readonly ElementKind[] = ['window', 'door'];

export const DWELLING_STATUSES = [
	'draft',
	'issued',
	'awaiting-review',
	'accepted',
	'changed-after-acceptance',
	'returned',
	'archived'
] as const;
export type DwellingStatus = (typeof DWELLING_STATUSES)[number];
export const DWELLING_STATUS_LABELS: Record<DwellingStatus, string> = {
	draft: 'Draft',
	issued: 'Issued',
	'awaiting-review': 'Awaiting review',
	accepted: 'Accepted',
	'changed-after-acceptance': 'Changed after acceptance',
	returned: 'Returned',
	archived: 'Archived'
};
