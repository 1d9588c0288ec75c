// A dwelling report's snapshot built in memory, without the database, shaped like a demo dwelling: a
// cavity wall that meets its limit, a solid brick wall that does not and is cold enough inside for
// mould, a timber-frame wall without a vapour control layer whose condensate builds up, a roof, a floor
// on the ground, a window and a door with given U-values (the door's kind has no limit). Build-ups,
// limits, humidity and climate are invented for these tests (common practice, no source); every result
// is the engine's own.
import { analyseElement, parseElementInput, ENGINE_VERSION } from '../../../src/lib/physics';
import {
	toElementInput,
	type StoredBuildUp,
	type StoredInternal
} from '../../../src/lib/dwellings/element-input';
import { DEFAULT_HEAT_FLOW, type ElementKind } from '../../../src/lib/dwellings/kinds';
import type { ReportSnapshot, SnapshotElement } from '../../../src/lib/server/reports/snapshot';
import { MONTHS } from './junction-snapshot';

const layer = (name: string, thicknessMm: number, lambda: number, mu: number) => ({
	name,
	thicknessMm,
	lambda,
	mu
});

export const LIMITS: Partial<Record<ElementKind, number>> = {
	'external-wall': 0.3,
	'pitched-roof-ceiling': 0.16,
	'ground-floor': 0.25,
	window: 1.6
};

const climate = {
	id: 'c1',
	name: 'Invented test climate',
	source: 'Invented',
	illustrative: true,
	months: MONTHS
};

/** An element with a build-up, computed by the engine, judged against LIMITS. */
export function built(
	n: number,
	name: string,
	kind: ElementKind,
	area: number,
	buildUp: StoredBuildUp,
	internal: StoredInternal = { temperature: 20, humidityClass: 3 }
): SnapshotElement {
	const heatFlow = DEFAULT_HEAT_FLOW[kind];
	const parsed = parseElementInput(toElementInput({ heatFlow, buildUp, internal }, MONTHS));
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
	const result = analyseElement(parsed.data);
	const limit = LIMITS[kind] ?? null;
	return {
		id: `00000000-0000-4000-8000-0000000ce${String(n).padStart(3, '0')}`,
		name,
		kind,
		area,
		heatFlow,
		givenU: null,
		givenUSource: null,
		buildUp,
		internal,
		climate,
		input: parsed.data,
		result,
		u: result.uValueRounded,
		limit,
		pass: limit === null ? null : result.uValueRounded <= limit,
		materialRevisions: []
	};
}

/** A window or door with a given U-value. */
export function given(n: number, name: string, kind: ElementKind, area: number, u: number): SnapshotElement {
	const limit = LIMITS[kind] ?? null;
	return {
		id: `00000000-0000-4000-8000-0000000ce${String(n).padStart(3, '0')}`,
		name,
		kind,
		area,
		heatFlow: 'horizontal',
		givenU: u,
		givenUSource: 'Maker’s declaration (invented for the test)',
		buildUp: null,
		internal: null,
		climate: null,
		input: null,
		result: null,
		u,
		limit,
		pass: limit === null ? null : u <= limit,
		materialRevisions: []
	};
}

export const CAVITY_WALL = () =>
	built(1, 'Cavity wall', 'external-wall', 62, {
		layers: [
			layer('Plaster', 13, 0.5, 10),
			layer('Block', 100, 0.5, 10),
			layer('Mineral wool', 100, 0.035, 1),
			layer('Brick', 100, 0.77, 10)
		]
	});
/** Solid brick without insulation: U far above 0.30, and a cold inside face at humidity class 4. */
export const SOLID_WALL = () =>
	built(
		2,
		'Solid brick wall',
		'external-wall',
		18,
		{ layers: [layer('Plaster', 13, 0.5, 10), layer('Brick', 215, 0.77, 10)] },
		{ temperature: 20, humidityClass: 4 }
	);
/** Timber frame with a vapour-tight board outside and no vapour control layer inside. */
export const TIMBER_WALL = () =>
	built(
		3,
		'Timber-frame extension wall',
		'external-wall',
		14,
		{
			layers: [
				layer('Plasterboard', 12.5, 0.25, 10),
				layer('Mineral wool', 140, 0.035, 1),
				{ name: 'Vapour-tight sheathing', thicknessMm: 10, lambda: 0.2, sd: 50 },
				layer('Render on board', 20, 0.5, 20)
			]
		} as StoredBuildUp,
		{ temperature: 20, relativeHumidity: 60 }
	);
export const ROOF = () =>
	built(4, 'Loft', 'pitched-roof-ceiling', 48, {
		layers: [layer('Plasterboard', 12.5, 0.25, 10), layer('Mineral wool', 270, 0.04, 1)]
	});
export const FLOOR = () =>
	built(5, 'Ground floor', 'ground-floor', 48, {
		layers: [layer('Screed', 65, 1.15, 50), layer('PIR', 100, 0.022, 60), layer('Slab', 150, 1.35, 100)],
		ground: { perimeterM: 28, areaM2: 48 }
	} as StoredBuildUp);
export const WINDOWS = () => given(6, 'Windows', 'window', 14, 1.4);
export const DOOR = () => given(7, 'Front door', 'door', 2, 1.8);

/** The snapshot of a dwelling report with these elements (issued unless `draft`). */
export function clientSnapshot(
	elements: SnapshotElement[],
	opts: { draft?: boolean; reference?: string; clientName?: string | null } = {}
): ReportSnapshot {
	const draft = opts.draft ?? false;
	return {
		dwelling: {
			id: '00000000-0000-4000-8000-0000000cd001',
			reference: opts.reference ?? 'CS-TEST-1',
			address: '4 Summary Row',
			programme: null,
			stage: 'design',
			clientName: opts.clientName === undefined ? 'Sam Client' : opts.clientName,
			clientEmail: 'sam@example.test',
			assessor: { id: 'u1', name: 'Test Assessor', email: 'a@example.test', registrationNumber: 'REG-1' }
		},
		organisation: { id: 'o1', name: 'Test Organisation' },
		limitTable: {
			id: 'l1',
			name: 'Test limits',
			edition: '2026',
			dated: null,
			source: 'Invented for tests',
			limits: LIMITS
		},
		elements,
		evidence: [],
		junctions: [],
		engineVersion: ENGINE_VERSION,
		issuedAt: '2026-03-01T10:00:00.000Z',
		document: {
			scope: 'dwelling',
			draft,
			number: draft ? 'DRAFT' : 'TO-2026-0001',
			revision: draft ? 0 : 1,
			verificationCode: draft ? null : 'ABCD2345EF',
			verifyUrl: draft ? null : 'http://127.0.0.1:3999/verify/ABCD2345EF',
			supersedes: null,
			issuedBy: { id: 'u1', name: 'Test Assessor', registrationNumber: 'REG-1' }
		}
	};
}
