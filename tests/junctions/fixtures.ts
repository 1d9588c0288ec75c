// Build-ups for the junction tests: generic, indicative values (common practice, no source), invented
// for these tests only.
import type { BuilderElement } from '../../src/lib/junctions/builder';

/** A cavity wall, inside to outside: plaster, block, full-fill insulation, brick (313 mm). */
export const CAVITY_WALL: BuilderElement = {
	name: 'Cavity wall',
	kind: 'external-wall',
	layers: [
		{ name: 'Plaster', thicknessMm: 13, lambda: 0.5 },
		{ name: 'Block', thicknessMm: 100, lambda: 0.5 },
		{ name: 'Mineral wool', thicknessMm: 100, lambda: 0.035 },
		{ name: 'Brick', thicknessMm: 100, lambda: 0.77 }
	]
};

/** A timber-frame wall with a different layer count (bridged studs at the λ of the insulation). */
export const FRAME_WALL: BuilderElement = {
	name: 'Frame wall',
	kind: 'external-wall',
	layers: [
		{ name: 'Board', thicknessMm: 12.5, lambda: 0.21 },
		{ name: 'Studs and wool', thicknessMm: 140, lambda: 0.035, bridge: { lambda: 0.13, fraction: 0.15 } },
		{ name: 'Sheathing', thicknessMm: 9, lambda: 0.13 },
		{ name: 'Membrane', thicknessMm: 0.5, resistance: 0 },
		{ name: 'Render board', thicknessMm: 20, lambda: 0.5 }
	]
};

/** A ground floor, top down: screed, PIR, slab. */
export const GROUND_FLOOR: BuilderElement = {
	name: 'Ground floor',
	kind: 'ground-floor',
	heatFlow: 'downward',
	layers: [
		{ name: 'Screed', thicknessMm: 65, lambda: 1.15 },
		{ name: 'PIR', thicknessMm: 100, lambda: 0.022 },
		{ name: 'Slab', thicknessMm: 150, lambda: 1.35 }
	],
	groundLambda: 2
};

export const CEILING: BuilderElement = {
	name: 'Loft ceiling',
	kind: 'pitched-roof-ceiling',
	heatFlow: 'upward',
	roofSpace: 'tiles-with-felt-or-boards',
	layers: [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21 },
		{ name: 'Mineral wool', thicknessMm: 270, lambda: 0.04 }
	]
};

export const PARTY_WALL: BuilderElement = {
	name: 'Party wall',
	kind: 'party-wall',
	layers: [
		{ name: 'Block', thicknessMm: 100, lambda: 0.5 },
		{ name: 'Cavity fill', thicknessMm: 50, lambda: 0.04 },
		{ name: 'Block', thicknessMm: 100, lambda: 0.5 }
	]
};

export const WINDOW: BuilderElement = { name: 'Window', kind: 'window', layers: [], givenU: 1.4 };
