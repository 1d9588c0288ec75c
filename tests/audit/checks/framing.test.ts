// Framed constructions without bridging: insulation between studs, joists or rafters is bridged by
// them, and the ISO 6946 combined method makes U worse. Which names say "between the members" is the
// audit's own rule (common practice, no source).
import { describe, it, expect } from 'vitest';
import {
	elementFramedWithoutBridging,
	isFramedElement,
	layerFramedWithoutBridging
} from '../../../src/lib/audit/checks/framing';
import { layerContext } from '../../../src/lib/audit/checks/context';
import type { Flag } from '../../../src/lib/audit/flags';
import type { StoredLayer } from '../../../src/lib/dwellings/element-input';
import { contextOf, element, layerOf, library, linked } from '../bundles';

const studs = { lambda: 0.13, fraction: 0.15 }; // softwood studs at 15 % (common practice, no source)

describe('layerFramedWithoutBridging', () => {
	it('flags insulation between framing members entered without a bridge', () => {
		const { wool } = library();
		const layer = linked(wool, 140, { name: 'Glass mineral wool between studs' });
		expect(layerFramedWithoutBridging(layerOf(layer, { rev: wool, index: 1 }))).toEqual([
			{
				code: 'framed-without-bridging',
				severity: 'high',
				elementId: 'e1',
				layerIndex: 1,
				reason:
					'Front wall (External wall), layer 2 "Glass mineral wool between studs" sits between framing members but was entered without bridging; the studs, joists or rafters make U worse (ISO 6946 combined method).'
			}
		]);
		const unlinked = { name: 'PIR in the rafters', thicknessMm: 100, lambda: 0.022 };
		expect(layerFramedWithoutBridging(layerOf(unlinked))).toHaveLength(1);
	});
	it('raises nothing with a bridge, across or below the members, or for a layer that is not insulation', () => {
		const { wool, osb } = library();
		const bridged = linked(wool, 100, { name: 'Glass mineral wool between joists', bridge: studs });
		expect(layerFramedWithoutBridging(layerOf(bridged, { rev: wool }))).toEqual([]);
		const across = linked(wool, 170, { name: 'Glass mineral wool across joists' });
		expect(layerFramedWithoutBridging(layerOf(across, { rev: wool }))).toEqual([]);
		const below = { name: 'Wool quilt in the joists, below the deck', thicknessMm: 100, lambda: 0.04 };
		expect(layerFramedWithoutBridging(layerOf(below))).toEqual([]);
		const boards = linked(osb, 18, { name: 'OSB between studs' });
		expect(layerFramedWithoutBridging(layerOf(boards, { rev: osb }))).toEqual([]);
	});
});

describe('elementFramedWithoutBridging', () => {
	const lib = library();
	const layersOf = (
		el: ReturnType<typeof element>,
		layers: StoredLayer[],
		revs = [lib.board, lib.pir, lib.osb]
	) => {
		const ctx = contextOf(el);
		return { ctx, layers: layers.map((l, i) => layerContext(ctx, i, l, revs[i], revs[i])) };
	};
	const rafters = (layers: StoredLayer[]) =>
		element('e3', layers, { name: 'Rafter roof', kind: 'pitched-roof-rafters', heatFlow: 'upward' });

	it('flags a framed element with insulation and no bridged layer', () => {
		const layers = [linked(lib.board, 12.5), linked(lib.pir, 120), linked(lib.osb, 18)];
		const { ctx, layers: ls } = layersOf(rafters(layers), layers);
		expect(elementFramedWithoutBridging(ctx, ls, [])).toEqual([
			{
				code: 'framed-without-bridging',
				severity: 'high',
				elementId: 'e3',
				reason:
					'Rafter roof (Pitched roof, insulated at rafters) is a framed construction but no layer is bridged; enter the framing as a bridge in the insulation layer between the members (ISO 6946 combined method).'
			}
		]);
		expect(isFramedElement(contextOf(element('e1', [], { name: 'Timber-frame wall' })))).toBe(true);
		expect(isFramedElement(contextOf(element('e1', [], { name: 'Stud wall to garage' })))).toBe(true);
	});
	it('raises nothing with a bridged layer, without insulation, when a layer is already flagged, or for a masonry wall', () => {
		const bridged = [linked(lib.board, 12.5), linked(lib.pir, 120, { bridge: studs }), linked(lib.osb, 18)];
		const a = layersOf(rafters(bridged), bridged);
		expect(elementFramedWithoutBridging(a.ctx, a.layers, [])).toEqual([]);
		const bare = [linked(lib.board, 12.5), linked(lib.osb, 18)];
		const b = layersOf(rafters(bare), bare, [lib.board, lib.osb]);
		expect(elementFramedWithoutBridging(b.ctx, b.layers, [])).toEqual([]);
		const plain = [linked(lib.board, 12.5), linked(lib.pir, 120), linked(lib.osb, 18)];
		const c = layersOf(rafters(plain), plain);
		const earlier: Flag[] = [
			{ code: 'framed-without-bridging', severity: 'high', elementId: 'e3', layerIndex: 1, reason: '…' }
		];
		expect(elementFramedWithoutBridging(c.ctx, c.layers, earlier)).toEqual([]);
		const wall = layersOf(element('e1', plain), plain);
		expect(elementFramedWithoutBridging(wall.ctx, wall.layers, [])).toEqual([]);
	});
});
