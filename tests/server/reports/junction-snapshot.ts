// A dwelling report's snapshot built in memory, without the database, for the tests of the junction
// pages: a cavity wall and a ground floor (generic, indicative values invented for these tests; common
// practice, no source), an external corner and a wall–ground floor junction computed as the report
// computes them, and a lintel whose ψ is entered from another source. The climate is invented.
import { analyseElement, parseElementInput, ENGINE_VERSION } from '../../../src/lib/physics';
import { toElementInput, type StoredBuildUp } from '../../../src/lib/dwellings/element-input';
import { runJunction, type ElementLike } from '../../../src/lib/junctions/run';
import { compactField, REPORT_FIELD_LINES } from '../../../src/lib/server/reports/junctions';
import type {
	ReportSnapshot,
	SnapshotElement,
	SnapshotJunction
} from '../../../src/lib/server/reports/snapshot';
import type { JunctionDetails } from '../../../src/lib/junctions/schema';
import type { DimensionSystem, JunctionType } from '../../../src/lib/junctions/kinds';

/** Twelve invented months (a cold winter, not a real place). */
export const MONTHS = [-4, -3, 1, 6, 11, 14, 16, 16, 12, 8, 3, -2].map((temperature, i) => ({
	month: i + 1,
	temperature,
	relativeHumidity: [88, 86, 82, 76, 73, 73, 75, 77, 81, 85, 88, 89][i]
}));

const layer = (name: string, thicknessMm: number, lambda: number, mu: number) => ({
	name,
	thicknessMm,
	lambda,
	mu
});

export const WALL_ID = '00000000-0000-4000-8000-00000000a001';
export const FLOOR_ID = '00000000-0000-4000-8000-00000000a002';

const WALL: StoredBuildUp = {
	layers: [
		layer('Plaster', 13, 0.5, 10),
		layer('Block', 100, 0.5, 10),
		layer('Mineral wool', 100, 0.035, 1),
		layer('Brick', 100, 0.77, 10)
	]
};
const FLOOR: StoredBuildUp = {
	layers: [layer('Screed', 65, 1.15, 50), layer('PIR', 100, 0.022, 60), layer('Slab', 150, 1.35, 100)],
	ground: { perimeterM: 30, areaM2: 50 }
} as StoredBuildUp;

const climate = {
	id: 'c1',
	name: 'Invented test climate',
	source: 'Invented',
	illustrative: true,
	months: MONTHS
};

function element(
	id: string,
	name: string,
	kind: 'external-wall' | 'ground-floor',
	area: number,
	buildUp: StoredBuildUp
) {
	const heatFlow = kind === 'ground-floor' ? 'downward' : 'horizontal';
	const internal = { temperature: 20, humidityClass: 3 as const };
	const parsed = parseElementInput(toElementInput({ heatFlow, buildUp, internal }, MONTHS));
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
	const result = analyseElement(parsed.data);
	return {
		id,
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
		limit: 0.3,
		pass: result.uValueRounded <= 0.3,
		materialRevisions: []
	} as SnapshotElement;
}

export const ELEMENTS: SnapshotElement[] = [
	element(WALL_ID, 'Cavity wall', 'external-wall', 60, WALL),
	element(FLOOR_ID, 'Ground floor', 'ground-floor', 50, FLOOR)
];

const LIKE: ElementLike[] = ELEMENTS.map((e) => ({
	id: e.id,
	name: e.name,
	kind: e.kind,
	heatFlow: e.heatFlow,
	buildUp: e.buildUp,
	givenU: e.givenU ?? null,
	version: 1
}));

/** A calculated junction as the report freezes it (computed with the field, as at issue). */
export function calculated(
	id: string,
	name: string,
	type: JunctionType,
	lengthM: number,
	details: JunctionDetails,
	dimensionSystem: DimensionSystem = 'external'
): SnapshotJunction {
	const run = runJunction({
		type,
		dimensionSystem,
		details,
		elements: LIKE,
		months: MONTHS,
		field: { maxLines: REPORT_FIELD_LINES }
	});
	if (!run.ok) throw new Error(JSON.stringify(run.issues));
	return {
		id,
		name,
		type,
		lengthM,
		source: 'calculated',
		dimensionSystem,
		psiEntered: null,
		psiSource: null,
		details,
		model: run.model,
		psi: run.result.psi,
		result: run.result,
		field: run.field ? compactField(run.field) : null
	};
}

export const CORNER = () =>
	calculated('00000000-0000-4000-8000-00000000b001', 'Corners', 'external-corner', 10.4, {
		mode: 'builder',
		elements: { a: WALL_ID }
	});
export const EDGE = () =>
	calculated('00000000-0000-4000-8000-00000000b002', 'Ground floor edge', 'ground-floor', 30, {
		mode: 'builder',
		elements: { a: WALL_ID, b: FLOOR_ID }
	});
export const LINTEL: SnapshotJunction = {
	id: '00000000-0000-4000-8000-00000000b003',
	name: 'Lintels',
	type: 'window-head',
	lengthM: 6,
	source: 'entered',
	dimensionSystem: 'external',
	psiEntered: 0.3,
	psiSource: 'Default table value, assumed (test)',
	details: null,
	model: null,
	psi: 0.3,
	result: null,
	field: null
};

/** The snapshot of a draft dwelling report with these junctions (none: as frozen before junctions). */
export function snapshotWith(junctions: SnapshotJunction[] | undefined): ReportSnapshot {
	return {
		dwelling: {
			id: '00000000-0000-4000-8000-00000000d001',
			reference: 'JN-TEST-1',
			address: '1 Junction Lane',
			programme: null,
			stage: 'design',
			clientName: null,
			clientEmail: null,
			assessor: { id: 'u1', name: 'Test Assessor', email: 'a@example.test', registrationNumber: 'REG-1' }
		},
		organisation: { id: 'o1', name: 'Test Organisation' },
		limitTable: {
			id: 'l1',
			name: 'Test limits',
			edition: '2026',
			dated: null,
			source: 'Invented for tests',
			limits: { 'external-wall': 0.3 }
		},
		elements: ELEMENTS,
		evidence: [],
		...(junctions ? { junctions } : {}),
		engineVersion: ENGINE_VERSION,
		issuedAt: '2026-03-01T10:00:00.000Z',
		document: {
			scope: 'dwelling',
			draft: true,
			number: 'DRAFT',
			revision: 0,
			verificationCode: null,
			verifyUrl: null,
			supersedes: null,
			issuedBy: { id: 'u1', name: 'Test Assessor', registrationNumber: 'REG-1' }
		}
	};
}
