// Characterisation of auditDwelling: a varied set of dwellings that together raise every flag, each
// with its whole audit (flags in order with their messages, severities and numbers; the recomputed
// figures) recorded in __snapshots__/assess.test.ts.snap. The record was taken from auditDwelling as it
// stood before it was split into one rule per flag, so it pins that the split changed nothing; it is
// not a check of the physics (the engine's own tests compare it with ISO 6946 and ISO 13788). Which
// flag each dwelling is meant to raise is listed beside it; the audit's rules are common practice, no
// source, unless the message names one.
import { describe, it, expect } from 'vitest';
import { auditDwelling, type AnalysisCache, type DwellingBundle } from '../../src/lib/audit/assess';
import { FLAG_CODES, type FlagCode } from '../../src/lib/audit/flags';
import {
	bundleOf,
	cleanWallLayers,
	element,
	enteredJunction,
	glazed,
	junction,
	library,
	linked,
	rev
} from './bundles';

type Scenario = { name: string; raises: FlagCode[]; build: () => DwellingBundle };

const SCENARIOS: Scenario[] = [
	{
		name: 'a clean, issued, reproducing wall',
		raises: [],
		build: () => bundleOf([element('e1', cleanWallLayers())])
	},
	{
		name: 'no issued report and no limit table',
		raises: ['not-issued'],
		build: () => bundleOf([element('e1', cleanWallLayers())], { issued: false, limitTable: null })
	},
	{
		name: 'U over the limit: a build-up, a given window U, a door exactly at its limit',
		raises: ['u-over-limit'],
		build: () => {
			const b = bundleOf([
				element('e1', cleanWallLayers()),
				glazed('w1', 2.8),
				glazed('d1', 1.8, { name: 'Front door', kind: 'door' })
			]);
			b.limitTable!.limits['external-wall'] = 0.15;
			return b;
		}
	},
	{
		name: 'U over the limit of a table without name or edition',
		raises: ['u-over-limit'],
		build: () =>
			bundleOf([element('e1', cleanWallLayers()), glazed('w1', 2.0)], {
				limitTable: { name: '', edition: '', limits: { 'external-wall': 0.15, window: 1.6 } }
			})
	},
	{
		name: 'given U-values outside the usual range, and elements given by U or by nothing',
		raises: ['thickness-implausible', 'recompute-failed'],
		build: () =>
			bundleOf([
				glazed('w1', 7.5),
				glazed('w2', 0.2, { name: 'Rooflight' }),
				glazed('d1', null, { name: 'Back door', kind: 'door' }),
				glazed('e1', 0.25, { name: 'Curtain wall', kind: 'external-wall' })
			])
	},
	{
		name: 'interstitial condensation that does not dry out',
		raises: ['condensation-accumulates'],
		build: () =>
			bundleOf(
				[
					element(
						'e1',
						[
							{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 4 },
							{ name: 'Mineral wool', thicknessMm: 150, lambda: 0.035, mu: 1 },
							{ name: 'Bitumen sheet outside', thicknessMm: 4, lambda: 0.23, sd: 200 }
						],
						{ internal: { temperature: 20, humidityClass: 4 } }
					)
				],
				{ issued: false }
			)
	},
	{
		name: 'surface mould risk on an uninsulated wall',
		raises: ['surface-mould-risk'],
		build: () =>
			bundleOf(
				[
					element('e1', [{ name: 'Single brick', thicknessMm: 102, lambda: 0.77, mu: 10 }], {
						internal: { temperature: 20, humidityClass: 4 }
					})
				],
				{ issued: false }
			)
	},
	{
		name: 'an inside temperature outside the usual range',
		raises: ['input-implausible'],
		build: () =>
			bundleOf(
				[
					element('e1', cleanWallLayers(), {
						internal: { temperature: 40, humidityClass: 3 }
					})
				],
				{ issued: false }
			)
	},
	{
		name: 'λ outside the plausible range, from the library category or the layer name',
		raises: ['lambda-implausible'],
		build: () => {
			const lib = library();
			lib.pir.lambda = 0.2;
			lib.brick.lambda = 5;
			return bundleOf(
				[
					element('e1', [
						linked(lib.plaster, 13),
						{ name: 'Mineral wool quilt', thicknessMm: 100, lambda: 0.12, mu: 1 },
						linked(lib.pir, 50),
						{ name: 'Unknown board', thicknessMm: 20, lambda: 9, mu: 10 },
						{ name: 'Cavity', thicknessMm: 50, air: 'unventilated', mu: 1 },
						linked(lib.brick, 102)
					])
				],
				{ revisions: Object.values(lib), issued: false }
			);
		}
	},
	{
		name: 'revisions not in the library or not verified, used in one place or several',
		raises: ['material-unverified'],
		build: () => {
			const lib = library();
			lib.brick.status = 'unverified';
			lib.block.status = 'unverified';
			lib.block.code = null;
			const ghost = rev('ghost', { name: 'Lost board' });
			return bundleOf(
				[
					element('e1', [...cleanWallLayers(lib).slice(0, 3), linked(ghost, 20), linked(lib.brick, 102)]),
					element(
						'e2',
						[linked(lib.plaster, 13), linked(lib.pir, 100), linked(lib.brick, 102), linked(lib.brick, 102)],
						{ name: 'Rear wall' }
					)
				],
				{ revisions: Object.values(lib) }
			);
		}
	},
	{
		name: "superseded revisions, and the library's current revisions giving another U",
		raises: ['material-superseded', 'library-changed'],
		build: () => {
			const lib = library();
			lib.brick.status = 'superseded';
			const vcl = rev('vcl', {
				name: 'Vapour control layer',
				code: null,
				category: 'membranes',
				lambda: null,
				resistance: 0,
				muDry: null,
				sd: 50
			});
			const vcl2 = rev('vcl2', { ...vcl, id: 'vcl2', revision: 2, sd: 100 });
			const pir2 = rev('pir2', { ...lib.pir, id: 'pir2', revision: 2, lambda: 0.026 });
			return bundleOf(
				[
					element('e1', [
						linked(lib.plaster, 13),
						linked(vcl, 0.2),
						linked(lib.block, 100),
						linked(lib.pir, 100),
						linked(lib.brick, 102)
					])
				],
				{ revisions: [...Object.values(lib), vcl], current: [vcl2, pir2] }
			);
		}
	},
	{
		name: 'layers linked by material only or by revision only, and a current revision that fails',
		raises: ['material-superseded'],
		build: () => {
			const lib = library();
			const pir2 = rev('pir2', { ...lib.pir, id: 'pir2', revision: 2, lambda: 0.03 });
			const brick2 = rev('brick2', { ...lib.brick, id: 'brick2', revision: 2, lambda: -1 });
			const { materialRevisionId: _, ...pirByMaterial } = linked(lib.pir, 100);
			const { materialId: __, ...blockByRevision } = linked(lib.block, 100);
			return bundleOf(
				[
					element('e1', [
						linked(lib.plaster, 13),
						blockByRevision,
						pirByMaterial,
						{ name: 'Clay brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
					]),
					element('e2', cleanWallLayers(lib), { name: 'Rear wall' })
				],
				{ current: [pir2, brick2] }
			);
		}
	},
	{
		name: 'framed constructions with and without bridging',
		raises: ['framed-without-bridging'],
		build: () => {
			const lib = library();
			const studs = { lambda: 0.13, fraction: 0.15, mu: 50 };
			return bundleOf(
				[
					element(
						'e1',
						[
							linked(lib.board, 12.5),
							linked(lib.wool, 140, { name: 'Glass mineral wool between studs' }),
							linked(lib.osb, 9),
							linked(lib.brick, 102)
						],
						{ name: 'Timber frame wall' }
					),
					element(
						'e2',
						[
							linked(lib.board, 12.5),
							linked(lib.wool, 100, { name: 'Glass mineral wool between joists', bridge: studs }),
							linked(lib.wool, 170, { name: 'Glass mineral wool across joists' })
						],
						{ name: 'Loft', kind: 'pitched-roof-ceiling', heatFlow: 'upward' }
					),
					element('e3', [linked(lib.board, 12.5), linked(lib.pir, 120), linked(lib.osb, 18)], {
						name: 'Rafter roof',
						kind: 'pitched-roof-rafters',
						heatFlow: 'upward'
					}),
					element('e4', [linked(lib.plaster, 13), linked(lib.block, 100), linked(lib.brick, 102)], {
						name: 'Stud wall to garage'
					}),
					element(
						'e5',
						[
							linked(lib.osb, 18),
							{ name: 'PIR between joists', thicknessMm: 100, lambda: 0.022, mu: 60 },
							{ name: 'Wool quilt in the joists, below the deck', thicknessMm: 100, lambda: 0.04, mu: 1 },
							linked(lib.board, 12.5)
						],
						{ name: 'Flat roof', kind: 'flat-roof', heatFlow: 'upward' }
					)
				],
				{ issued: false }
			);
		}
	},
	{
		name: 'thicknesses outside what is supplied or plausible',
		raises: ['thickness-implausible'],
		build: () => {
			const lib = library();
			lib.block.thicknessMinMm = 75;
			lib.brick.thicknessMaxMm = 100;
			lib.osb.thicknessMinMm = 6;
			lib.osb.thicknessMaxMm = 25;
			return bundleOf(
				[
					element('e1', [
						linked(lib.plaster, 13),
						linked(lib.block, 50),
						linked(lib.pir, 650),
						linked(lib.osb, 18),
						linked(lib.brick, 102)
					]),
					element('e2', [{ name: 'Render', thicknessMm: 20, lambda: 0.8, mu: 10 }], { name: 'Thin wall' }),
					element(
						'e3',
						[
							{ name: 'Dense block', thicknessMm: 350, lambda: 1.1, mu: 10 },
							{ name: 'Dense block', thicknessMm: 350.4, lambda: 1.1, mu: 10 }
						],
						{ name: 'Party wall', kind: 'party-wall' }
					)
				],
				{ revisions: Object.values(lib), issued: false }
			);
		}
	},
	{
		name: 'a generic table λ for insulation, used in several places',
		raises: ['generic-lambda'],
		build: () => {
			const lib = library();
			lib.pir.lambdaKind = 'table';
			lib.brick.lambdaKind = 'table';
			lib.wool.lambdaKind = 'table';
			lib.wool.code = null;
			return bundleOf(
				[
					element('e1', cleanWallLayers(lib)),
					element('e2', cleanWallLayers(lib), { name: 'Rear wall' }),
					element(
						'e3',
						[linked(lib.board, 12.5), linked(lib.wool, 100), linked(lib.wool, 200), linked(lib.pir, 50)],
						{ name: 'Loft', kind: 'pitched-roof-ceiling', heatFlow: 'upward' }
					)
				],
				{ revisions: Object.values(lib) }
			);
		}
	},
	{
		name: 'layer values changed by hand from their revision',
		raises: ['values-differ-from-revision'],
		build: () => {
			const lib = library();
			const vcl = rev('vcl', {
				name: 'Vapour control layer',
				category: 'membranes',
				lambda: null,
				resistance: 0.02,
				muDry: null,
				sd: 50
			});
			const cavity = rev('cavity', { name: 'Cavity', category: 'masonry', lambda: 0.5, muDry: 1 });
			return bundleOf(
				[
					element('e1', [
						linked(lib.plaster, 13, { mu: 6 }),
						linked(vcl, 0.2, { resistance: 0.05 }),
						linked(lib.block, 100, { lambda: 0.11, mu: 5 }),
						linked(cavity, 50, { lambda: undefined, air: 'unventilated' }),
						linked(lib.pir, 100),
						linked(lib.brick, 102, { lambda: 0.77 + 1e-12 })
					])
				],
				{ revisions: [...Object.values(lib), vcl, cavity] }
			);
		}
	},
	{
		name: 'issued numbers that do not reproduce',
		raises: ['not-reproducing'],
		build: () => {
			const walls = [1, 2, 3, 4, 5, 6].map((i) => element(`e${i}`, cleanWallLayers(), { name: `Wall ${i}` }));
			const b = bundleOf(walls);
			const snaps = b.report!.snapshot.elements!;
			snaps[0].result!.uValue += 0.02;
			snaps[1].result!.uValue -= 0.02;
			snaps[2].result!.condensation!.outcome =
				snaps[2].result!.condensation!.outcome === 'accumulates' ? 'none' : 'accumulates';
			snaps[3].input = { ...snaps[3].input!, layers: [] };
			snaps[4].input = null;
			delete snaps[4].materialRevisions;
			snaps[5].result!.uValue += 0.004; // within the tolerance
			return b;
		}
	},
	{
		name: 'a stale report: changed, added and removed elements',
		raises: ['stale-report'],
		build: () => {
			const b = bundleOf([
				element('e1', cleanWallLayers()),
				glazed('w1', 1.4),
				element('e3', cleanWallLayers(), { name: 'Gable wall' }),
				element('e5', cleanWallLayers(), { name: 'Old lean-to wall' }),
				glazed('w6', null, { name: 'Rooflight' }),
				element('e7', cleanWallLayers(), { name: 'Rear wall', climateId: null })
			]);
			const [e1, w1, e3, , w6] = b.elements;
			e1.buildUp!.layers[2].thicknessMm = 120;
			w1.givenU = 1.2;
			w1.area = 2.5;
			e3.kind = 'party-wall';
			e3.heatFlow = 'upward';
			e3.internal = { temperature: 21, humidityClass: 3 };
			e3.climateId = 'c2';
			w6.givenU = 1.4;
			b.elements = [
				...b.elements.filter((e) => e.id !== 'e5'),
				element('e4', cleanWallLayers(), { name: 'Extension wall' })
			];
			return b;
		}
	},
	{
		name: 'elements that cannot be recomputed',
		raises: ['recompute-failed'],
		build: () =>
			bundleOf([
				glazed('e1', null, { name: 'Side wall', kind: 'external-wall' }),
				element('e2', []),
				element('e3', [{ name: 'Brick', thicknessMm: -5, lambda: 0.77, mu: 10 }], { name: 'Bad wall' }),
				element('e4', [{ name: 'Brick', thicknessMm: -5, lambda: 0.77, mu: 10 }], { name: 'Bad wall' })
			])
	},
	{
		name: 'odd report records: a revision list that disagrees with the layers, a record without input',
		raises: ['not-reproducing', 'stale-report'],
		build: () => {
			const lib = library();
			const blockOld = rev('block-old', { ...lib.block, id: 'block-old', lambda: 0.2 });
			const b = bundleOf(
				[element('e1', cleanWallLayers(lib)), element('e2', cleanWallLayers(lib), { name: 'Rear wall' })],
				{
					revisions: [blockOld, ...Object.values(lib)] // the current block stays lib.block
				}
			);
			const [s1, s2] = b.report!.snapshot.elements!;
			s1.materialRevisions![1].revisionId = 'block-old';
			s2.input = null;
			s2.buildUp = null;
			return b;
		}
	},
	{
		name: 'climates: the dwelling’s, an unknown one, none',
		raises: ['not-issued'],
		build: () =>
			bundleOf(
				[
					element('e1', cleanWallLayers(), { climateId: null }),
					element('e2', cleanWallLayers(), { climateId: 'unknown', internal: null }),
					element('e3', cleanWallLayers(), { climateId: 'c2' })
				],
				{ issued: false, climateId: null }
			)
	},
	{
		name: 'junctions reproducing as issued, and a ψ entered from a named source',
		raises: ['psi-entered'],
		build: () =>
			bundleOf([element('e1', cleanWallLayers())], {
				junctions: [junction('j1'), enteredJunction('j2', 0.3, 'Default table value, assumed (test)')]
			})
	},
	{
		name: 'junctions changed since issue: a thinner insulation moving ψ and fRsi, a length, an entered ψ, one added and one removed',
		raises: ['junction-changed', 'stale-report'],
		build: () => {
			const b = bundleOf([element('e1', cleanWallLayers())], {
				junctions: [
					junction('j1'),
					junction('j2', { name: 'Reveal corners', lengthM: 4 }),
					enteredJunction('j3', 0.3, 'Default table value (test)'),
					enteredJunction('j4', 0.1, 'Detail sheet 4 (test)', { name: 'Sills', type: 'window-sill' })
				]
			});
			b.elements[0].buildUp!.layers[2].thicknessMm = 40;
			const [j1, j2, j3] = b.junctions!;
			j2.lengthM = 5;
			j3.psiEntered = 0.25;
			b.junctions = [j1, j2, j3, junction('j5', { name: 'Inner corner', type: 'internal-corner' })];
			return b;
		}
	},
	{
		name: 'a report issued before junctions were reported',
		raises: ['stale-report'],
		build: () => {
			const b = bundleOf([element('e1', cleanWallLayers())]);
			b.junctions = [junction('j1')];
			return b;
		}
	},
	{
		name: 'a junction of an uninsulated wall below the month’s fRsi,min',
		raises: ['junction-frsi-below-limit'],
		build: () =>
			bundleOf([element('e1', [{ name: 'Single brick', thicknessMm: 102, lambda: 0.77, mu: 10 }])], {
				issued: false,
				junctions: [
					junction('j1', {
						details: {
							mode: 'builder',
							elements: { a: 'e1' },
							internal: { temperature: 20, humidityClass: 4 }
						}
					})
				]
			})
	},
	{
		name: 'a junction below the figure for dwellings, the dwelling without a climate',
		raises: ['junction-frsi-below-limit'],
		build: () =>
			bundleOf(
				[
					element('e1', [{ name: 'Single brick', thicknessMm: 102, lambda: 0.77, mu: 10 }], {
						climateId: null
					})
				],
				{ issued: false, climateId: null, junctions: [junction('j1')] }
			)
	},
	{
		name: 'entered ψ-values without a usable source, and junctions that cannot be recomputed',
		raises: ['psi-without-source', 'psi-entered', 'recompute-failed'],
		build: () =>
			bundleOf([element('e1', cleanWallLayers())], {
				issued: false,
				junctions: [
					enteredJunction('j1', 0.1, 'n/a'),
					enteredJunction('j2', 0.2, null, { name: 'Heads' }),
					enteredJunction('j3', 0.05, 'Manufacturer’s detail sheet D-12 (test)', { name: 'Sills' }),
					junction('j4', { name: 'Lost corner', details: { mode: 'builder', elements: { a: 'gone' } } }),
					junction('j5', {
						name: 'Sketch',
						type: 'other',
						details: { mode: 'free-form', elements: {} },
						model: { regions: [], boundaries: [], environments: {} }
					}),
					junction('j6', { name: 'No choices', details: null })
				]
			})
	}
];

/** The whole output in the order of its keys, with undefined and non-finite numbers kept visible. */
function serialise(v: unknown): string {
	return JSON.stringify(
		v,
		(_k, x) =>
			x === undefined ? '[undefined]' : typeof x === 'number' && !Number.isFinite(x) ? `[${x}]` : x,
		1
	);
}

describe('auditDwelling, characterised', () => {
	for (const s of SCENARIOS) {
		it(s.name, () => {
			const audit = auditDwelling(s.build());
			const codes = audit.flags.map((f) => f.code);
			for (const c of s.raises) expect(codes).toContain(c);
			expect(serialise(audit)).toMatchSnapshot();
		});
	}

	it('the scenarios raise every flag code', () => {
		const raised = new Set(SCENARIOS.flatMap((s) => auditDwelling(s.build()).flags.map((f) => f.code)));
		expect([...raised].sort()).toEqual([...FLAG_CODES].sort());
	});

	it('a cache shared over the batch, and used twice, changes nothing', () => {
		const cache: AnalysisCache = new Map();
		for (let round = 0; round < 2; round++)
			for (const s of SCENARIOS)
				expect(serialise(auditDwelling(s.build(), cache))).toBe(serialise(auditDwelling(s.build())));
	});

	it('does not change its input', () => {
		for (const s of SCENARIOS) {
			const b = s.build();
			const before = serialise({
				...b,
				climates: [...b.climates],
				revisions: [...b.revisions],
				currentRevisions: [...b.currentRevisions]
			});
			auditDwelling(b);
			expect(
				serialise({
					...b,
					climates: [...b.climates],
					revisions: [...b.revisions],
					currentRevisions: [...b.currentRevisions]
				})
			).toBe(before);
		}
	});
});
