// Report rendering: an element report and an eight-element dwelling report, beside the floor — a
// one-page pdfmake document with the same embedded fonts — measured in the same run. Targets: element
// report < 300 ms, dwelling report < 1.5 s. Build-ups and climate are invented for the benchmark.
import { analyseElement, type ElementInput } from '../src/lib/physics';
import { toElementInput, type StoredBuildUp } from '../src/lib/dwellings/element-input';
import { reportDocument } from '../src/lib/server/reports/document';
import { renderPdf, FONT } from '../src/lib/server/pdf';
import type { ReportSnapshot, SnapshotElement } from '../src/lib/server/reports/snapshot';
import type { ElementKind } from '../src/lib/dwellings/kinds';

const months = [
	[1, 4.5, 87],
	[2, 4.7, 85],
	[3, 6.5, 81],
	[4, 8.6, 76],
	[5, 11.8, 74],
	[6, 14.6, 73],
	[7, 16.6, 73],
	[8, 16.4, 76],
	[9, 14.1, 79],
	[10, 10.9, 84],
	[11, 7.2, 87],
	[12, 5.1, 88]
].map(([month, temperature, relativeHumidity]) => ({ month, temperature, relativeHumidity }));
const climate = {
	id: 'c',
	name: 'Invented mild climate',
	source: 'invented for the benchmark',
	illustrative: true,
	months
};

const L = {
	plaster: { name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
	board: { name: 'Gypsum plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	block: { name: 'Aerated concrete block', thicknessMm: 100, lambda: 0.14, mu: 10 },
	brick: { name: 'Clay brick', thicknessMm: 102.5, lambda: 0.77, mu: 10 },
	wool: { name: 'Glass mineral wool', thicknessMm: 100, lambda: 0.035, mu: 1 },
	eps: { name: 'EPS', thicknessMm: 120, lambda: 0.036, mu: 60 },
	render: { name: 'Render', thicknessMm: 10, lambda: 1.0, mu: 10 },
	osb: { name: 'OSB', thicknessMm: 18, lambda: 0.13, mu: 50 },
	vcl: { name: 'Vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 50 },
	felt: { name: 'Bitumen felt', thicknessMm: 5, lambda: 0.23, mu: 50000 },
	slab: { name: 'Concrete slab', thicknessMm: 150, lambda: 1.35, mu: 100 },
	xps: { name: 'XPS', thicknessMm: 100, lambda: 0.034, mu: 150 },
	screed: { name: 'Screed', thicknessMm: 65, lambda: 1.4, mu: 50 }
};
const studs = {
	bridge: { lambda: 0.13, fraction: 38 / 600, name: 'studs' },
	bridgeGeometry: { widthMm: 38, centresMm: 600 }
};

const specs: [string, ElementKind, 'upward' | 'horizontal' | 'downward', number, StoredBuildUp | number][] = [
	['Cavity wall', 'external-wall', 'horizontal', 62, { layers: [L.plaster, L.block, L.wool, L.brick] }],
	[
		'Solid wall, external insulation',
		'external-wall',
		'horizontal',
		30,
		{ layers: [L.plaster, { ...L.brick, thicknessMm: 215 }, L.eps, L.render] }
	],
	[
		'Timber frame wall',
		'external-wall',
		'horizontal',
		24,
		{ layers: [L.board, L.vcl, { ...L.wool, thicknessMm: 140, ...studs }, L.osb, L.render] }
	],
	[
		'Loft',
		'pitched-roof-ceiling',
		'upward',
		41,
		{ layers: [L.board, { ...L.wool, ...studs }, { ...L.wool, thicknessMm: 170 }] }
	],
	[
		'Flat roof',
		'flat-roof',
		'upward',
		12,
		{ layers: [L.board, L.vcl, L.osb, { ...L.xps, thicknessMm: 120 }, L.felt] }
	],
	['Ground floor', 'ground-floor', 'downward', 41, { layers: [L.screed, L.xps, L.slab] }],
	['Windows', 'window', 'horizontal', 14, 1.4],
	['Front door', 'door', 'horizontal', 1.9, 1.6]
];

const elements: SnapshotElement[] = specs.map(([name, kind, heatFlow, area, b], i) => {
	if (typeof b === 'number') {
		return {
			id: `e${i}`,
			name,
			kind,
			area,
			heatFlow,
			givenU: b,
			givenUSource: 'declared (invented)',
			buildUp: null,
			internal: null,
			climate: null,
			input: null,
			result: null,
			u: b,
			limit: 1.6,
			pass: b <= 1.6,
			materialRevisions: []
		};
	}
	const internal = { temperature: 20, humidityClass: 3 as const };
	const input: ElementInput = toElementInput({ heatFlow, buildUp: b, internal }, months);
	const result = analyseElement(input);
	return {
		id: `e${i}`,
		name,
		kind,
		area,
		heatFlow,
		buildUp: b,
		internal,
		climate,
		input,
		result,
		u: result.uValueRounded,
		limit: 0.3,
		pass: result.uValueRounded <= 0.3,
		materialRevisions: []
	};
});

const snapshot = (scope: 'element' | 'dwelling'): ReportSnapshot => ({
	dwelling: {
		id: 'd',
		reference: 'BENCH-001',
		address: '1 Bench Row',
		programme: null,
		stage: 'design',
		clientName: 'Client',
		clientEmail: 'c@example.test',
		assessor: { id: 'a', name: 'Assessor', email: 'a@example.test', registrationNumber: 'REG-1' }
	},
	organisation: { id: 'o', name: 'Bench organisation' },
	limitTable: { id: 'l', name: 'Bench limits', edition: '1', dated: null, source: null, limits: {} },
	elements: scope === 'element' ? [elements[2]] : elements,
	engineVersion: '1.0.0',
	issuedAt: '2026-03-03T10:00:00.000Z',
	document: {
		scope,
		draft: false,
		number: 'BO-2026-0001',
		revision: 1,
		verificationCode: 'ABCDEFGHJK',
		verifyUrl: 'http://127.0.0.1:3000/verify/ABCDEFGHJK',
		supersedes: null,
		issuedBy: { id: 'a', name: 'Assessor' }
	}
});

async function median(label: string, runs: number, f: () => Promise<Buffer>) {
	await f(); // warm-up: module load, JIT
	const times: number[] = [];
	let bytes = 0;
	for (let i = 0; i < runs; i++) {
		const t = performance.now();
		bytes = (await f()).length;
		times.push(performance.now() - t);
	}
	times.sort((a, b) => a - b);
	return { label, ms: times[Math.floor(times.length / 2)], bytes };
}

const floor = await median('one-page pdfmake document, same fonts (floor)', 7, () =>
	renderPdf({
		content: [{ text: 'Floor', bold: true }, 'One page, the same embedded fonts.'],
		defaultStyle: { font: FONT }
	})
);
const el = await median('element report (bridged timber frame wall)', 7, () =>
	renderPdf(reportDocument(snapshot('element')))
);
const dw = await median('dwelling report (8 elements)', 3, () =>
	renderPdf(reportDocument(snapshot('dwelling')))
);

const line = (r: { label: string; ms: number; bytes: number }, target?: number) =>
	console.log(
		`${r.label}: ${r.ms.toFixed(0)} ms median, ${(r.bytes / 1024).toFixed(0)} KiB` +
			(target
				? `; ${(r.ms / floor.ms).toFixed(1)}× floor; target < ${target} ms ${r.ms < target ? 'met' : 'NOT MET'}`
				: '')
	);
line(floor);
line(el, 300);
line(dw, 1500);
