// The demo housing programme: an INVENTED retrofit programme of twelve dwellings for Northfield and one
// dwelling for Harbourline. Streets, clients and build-ups are made up for the demo; layer values are
// generic (common practice, no source) and are taken from the demo library (seed 02) by material code
// when it is there. Climates and the default limit table come from seed 03 by name; without them the
// elements are stored without moisture checks or limits. Results are computed with the engine.
// Idempotent: a dwelling whose reference exists is left as it is. One transaction.
import { tsImport } from 'tsx/esm/api';

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
const HARBOURLINE = '00000000-0000-4000-8000-000000000002';
const BEN = '00000000-0000-4000-8000-000000000102';
const CARLA = '00000000-0000-4000-8000-000000000103';
const FERN = '00000000-0000-4000-8000-000000000202';
const PROGRAMME = 'Larkfield Terraces retrofit (invented demo programme)';

const L = {
	plaster: { code: 'G-PLA-GYP-1000', name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
	board: { code: 'G-PLA-GYPBD-700', name: 'Gypsum plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	aircrete: { code: 'G-MAS-AAC-500', name: 'Aerated concrete block', thicknessMm: 100, lambda: 0.14, mu: 10 },
	brick: { code: 'G-MAS-BRICK-1800', name: 'Clay brick, dense', thicknessMm: 102.5, lambda: 0.77, mu: 10 },
	solidBrick: {
		code: 'G-MAS-BRICK-1800',
		name: 'Clay brick, dense (solid wall)',
		thicknessMm: 215,
		lambda: 0.77,
		mu: 10
	},
	glassWool: { code: 'G-INS-GLW-035', name: 'Glass mineral wool', thicknessMm: 100, lambda: 0.035, mu: 1 },
	stoneWool: { code: 'G-INS-RKW-036', name: 'Stone mineral wool', thicknessMm: 100, lambda: 0.036, mu: 1 },
	eps: { code: 'G-INS-EPS-036', name: 'Expanded polystyrene (EPS)', thicknessMm: 100, lambda: 0.036, mu: 60 },
	xps: {
		code: 'G-INS-XPS-034',
		name: 'Extruded polystyrene (XPS)',
		thicknessMm: 100,
		lambda: 0.034,
		mu: 150
	},
	pir: {
		code: 'G-INS-PIR-022',
		name: 'Polyisocyanurate board (PIR)',
		thicknessMm: 120,
		lambda: 0.022,
		mu: 60
	},
	woodFibre: {
		code: 'G-INS-WF-040',
		name: 'Wood fibre insulation board',
		thicknessMm: 60,
		lambda: 0.04,
		mu: 5
	},
	render: { code: 'G-PLA-CEM-1800', name: 'Cement and sand render', thicknessMm: 20, lambda: 1.0, mu: 10 },
	osb: { code: 'G-TIM-OSB-650', name: 'Oriented strand board (OSB)', thicknessMm: 18, lambda: 0.13, mu: 50 },
	ply: { code: 'G-TIM-PLY-500', name: 'Plywood deck', thicknessMm: 18, lambda: 0.13, mu: 200 },
	felt: { code: 'G-MEM-BIT-1100', name: 'Bitumen roofing felt', thicknessMm: 5, lambda: 0.23, mu: 50000 },
	vcl: {
		code: 'G-MEM-VCL-PE',
		name: 'Polyethylene vapour control layer',
		thicknessMm: 0.2,
		resistance: 0,
		sd: 50
	},
	breather: { code: 'G-MEM-BREATH', name: 'Breather membrane', thicknessMm: 0.5, resistance: 0, sd: 0.02 },
	screed: { code: 'G-CON-SCREED-2000', name: 'Sand and cement screed', thicknessMm: 65, lambda: 1.4, mu: 50 },
	slab: { code: 'G-CON-MED-2000', name: 'Concrete slab', thicknessMm: 150, lambda: 1.35, mu: 100 }
};
const with_ = (layer, over) => ({ ...layer, ...over });
const joists = (widthMm, centresMm) => ({
	bridge: { lambda: 0.13, fraction: widthMm / centresMm, mu: 50, name: 'Softwood joists' },
	bridgeGeometry: { widthMm, centresMm }
});

/** Constructions, layers inside → outside. */
const C = {
	cavityFull: {
		kind: 'external-wall',
		name: 'External wall, cavity full-fill',
		layers: [L.plaster, L.aircrete, L.glassWool, L.brick]
	},
	solidBrick: {
		kind: 'external-wall',
		name: 'External wall, solid brick (untreated)',
		layers: [L.plaster, L.solidBrick]
	},
	solidExternal: {
		kind: 'external-wall',
		name: 'External wall, solid brick with external insulation',
		layers: [
			L.plaster,
			L.solidBrick,
			with_(L.eps, { thicknessMm: 120 }),
			with_(L.render, { thicknessMm: 10 })
		]
	},
	timberFrame: {
		kind: 'external-wall',
		name: 'External wall, timber frame',
		layers: [
			L.board,
			L.vcl,
			with_(L.glassWool, {
				name: 'Glass mineral wool between studs',
				thicknessMm: 140,
				bridge: { lambda: 0.13, fraction: 0.15, mu: 50, name: 'Softwood studs' }
			}),
			with_(L.osb, { thicknessMm: 9 }),
			L.woodFibre,
			with_(L.render, { thicknessMm: 8 })
		]
	},
	loft: {
		kind: 'pitched-roof-ceiling',
		name: 'Loft, insulated at ceiling',
		layers: [
			L.board,
			with_(L.glassWool, { name: 'Glass mineral wool between joists', thicknessMm: 100, ...joists(47, 600) }),
			with_(L.glassWool, { name: 'Glass mineral wool across joists', thicknessMm: 170 })
		]
	},
	loftThin: {
		kind: 'pitched-roof-ceiling',
		name: 'Loft, existing 100 mm between joists',
		layers: [
			L.board,
			with_(L.glassWool, { name: 'Glass mineral wool between joists', thicknessMm: 100, ...joists(47, 400) })
		]
	},
	warmFlat: {
		kind: 'flat-roof',
		name: 'Flat roof, warm deck',
		layers: [L.board, L.vcl, L.ply, L.pir, L.felt]
	},
	coldFlatNoVcl: {
		kind: 'flat-roof',
		name: 'Flat roof over bathroom, cold deck without vapour control',
		humidityClass: 4,
		layers: [L.board, with_(L.glassWool, { thicknessMm: 150 }), L.ply, L.felt]
	},
	groundSlab: {
		kind: 'ground-floor',
		name: 'Ground floor, slab with XPS',
		layers: [L.screed, with_(L.xps, { thicknessMm: 100 }), L.slab]
	},
	suspendedTimber: {
		kind: 'exposed-floor',
		name: 'Floor over passage, timber joists',
		layers: [
			with_(L.osb, { name: 'Chipboard-type flooring', thicknessMm: 22 }),
			with_(L.stoneWool, { thicknessMm: 150, ...joists(47, 400) }),
			with_(L.board, { name: 'Soffit board' })
		]
	}
};
const windowEl = (area) => ({
	kind: 'window',
	name: 'Windows',
	area,
	givenU: 1.4,
	givenUSource: 'Manufacturer’s declaration (invented for the demo)'
});
const doorEl = () => ({
	kind: 'door',
	name: 'Front door',
	area: 1.9,
	givenU: 1.6,
	givenUSource: 'Manufacturer’s declaration (invented for the demo)'
});

const STREETS = ['Alder Row', 'Brambling Lane', 'Curlew Terrace', 'Dunnock Street'];
/**
 * An invented total floor area: two storeys over the ground floor's area, or none without a ground
 * floor among the elements.
 */
const floorArea = (els) => {
	const ground = els.find((e) => Array.isArray(e) && /^(ground|suspended)/i.test(e[0]));
	return ground ? ground[1] * 2 : null;
};

const NF_DWELLINGS = [
	{
		n: 1,
		assessor: BEN,
		status: 'draft',
		stage: 'design',
		els: [['cavityFull', 62], ['loft', 41], ['groundSlab', 41], windowEl(14), doorEl()]
	},
	{
		n: 2,
		assessor: BEN,
		status: 'draft',
		stage: 'design',
		els: [['solidBrick', 58], ['loftThin', 39], ['groundSlab', 39], windowEl(12)]
	},
	{
		n: 3,
		assessor: CARLA,
		status: 'draft',
		stage: 'design',
		els: [['solidExternal', 58], ['loft', 39], ['suspendedTimber', 6], windowEl(12), doorEl()]
	},
	{
		n: 4,
		assessor: CARLA,
		status: 'draft',
		stage: 'design',
		els: [['timberFrame', 70], ['warmFlat', 44], ['groundSlab', 44], windowEl(16)]
	},
	{
		n: 5,
		assessor: BEN,
		status: 'draft',
		stage: 'as-built',
		els: [['cavityFull', 60], ['coldFlatNoVcl', 8], ['loft', 33], ['groundSlab', 41], windowEl(13)]
	},
	{
		n: 6,
		assessor: BEN,
		status: 'draft',
		stage: 'design',
		els: [
			['cavityFull', 64],
			['loft', 42],
			['groundSlab', 42]
		]
	},
	{
		n: 7,
		assessor: CARLA,
		status: 'draft',
		stage: 'design',
		els: [['solidExternal', 55], ['loftThin', 38], windowEl(11)]
	},
	{
		n: 8,
		assessor: CARLA,
		status: 'draft',
		stage: 'as-built',
		els: [['timberFrame', 68], ['loft', 40], ['groundSlab', 40], windowEl(15), doorEl()]
	},
	{
		n: 9,
		assessor: BEN,
		status: 'draft',
		stage: 'design',
		els: [
			['cavityFull', 61],
			['warmFlat', 40],
			['groundSlab', 40]
		]
	},
	{
		n: 10,
		assessor: BEN,
		status: 'draft',
		stage: 'design',
		els: [
			['solidBrick', 57],
			['loft', 38],
			['suspendedTimber', 5]
		]
	},
	{
		n: 11,
		assessor: CARLA,
		status: 'draft',
		stage: 'design',
		els: [['cavityFull', 63], ['loft', 41], ['groundSlab', 41], windowEl(14)]
	},
	{
		n: 12,
		assessor: null,
		status: 'draft',
		stage: 'design',
		els: [
			['timberFrame', 66],
			['loft', 39]
		]
	}
];

/** @param {import('knex').Knex} knex */
export async function seed(knex) {
	const physics = await tsImport('../../src/lib/physics/index.ts', import.meta.url);
	const { toElementInput } = await tsImport('../../src/lib/dwellings/element-input.ts', import.meta.url);

	await knex.transaction(async (trx) => {
		for (const org of [NORTHFIELD, HARBOURLINE]) {
			const exists = await trx('organisations').where({ id: org }).first('id');
			if (!exists) continue;
			const climate =
				(await trx('climates')
					.where({ organisation_id: org, name: 'Demo inland city (invented)' })
					.first()) ?? (await trx('climates').where({ organisation_id: org }).orderBy('name').first());
			const materials = await trx('materials as m')
				.join('material_revisions as r', 'r.id', 'm.current_revision_id')
				.where('m.organisation_id', org)
				.select(
					'm.id',
					'm.code',
					'r.id as revision_id',
					'r.lambda',
					'r.resistance',
					'r.mu_dry',
					'r.sd',
					'r.density',
					'r.specific_heat'
				);
			const byCode = new Map(materials.map((m) => [m.code, m]));

			/** A stored layer: the library's values copied in when the code is there, else the generic ones. */
			const layer = (spec) => {
				const { code, ...rest } = spec;
				const m = code ? byCode.get(code) : undefined;
				if (!m) return rest;
				const out = { ...rest, materialId: m.id, materialRevisionId: m.revision_id, materialCode: m.code };
				if (m.lambda !== null && rest.lambda !== undefined) out.lambda = m.lambda;
				if (m.resistance !== null && rest.resistance !== undefined) out.resistance = m.resistance;
				if (m.mu_dry !== null && rest.mu !== undefined) out.mu = m.mu_dry;
				if (m.sd !== null && rest.sd !== undefined) out.sd = m.sd;
				// density and specific heat, as the editor copies them, for the heat storage (ISO 13786)
				if (m.density !== null && m.specific_heat !== null && rest.lambda !== undefined) {
					out.density = m.density;
					out.specificHeat = m.specific_heat;
				}
				return out;
			};

			const list =
				org === NORTHFIELD
					? NF_DWELLINGS.map((d) => ({
							reference: `LT-${String(d.n).padStart(3, '0')}`,
							address: `${d.n * 2 + 1} ${STREETS[d.n % STREETS.length]}, Larkfield (invented)`,
							programme: PROGRAMME,
							client: 'Larkfield Homes Cooperative (invented)',
							clientEmail: 'programme@larkfield-homes.example.test',
							...d
						}))
					: [
							{
								reference: 'HB-001',
								address: '4 Quayside Mews, Harbourline (invented)',
								programme: 'Harbourline single survey (invented)',
								client: 'A. Client (invented)',
								clientEmail: 'client@harbourline.example.test',
								assessor: FERN,
								status: 'draft',
								stage: 'design',
								els: [['cavityFull', 48], ['loft', 30], windowEl(9)]
							}
						];

			for (const d of list) {
				const found = await trx('dwellings')
					.where({ organisation_id: org, reference: d.reference })
					.first('id');
				if (found) continue;
				const [row] = await trx('dwellings')
					.insert({
						organisation_id: org,
						reference: d.reference,
						address: d.address,
						programme: d.programme,
						client_name: d.client,
						client_email: d.clientEmail,
						assessor_id: d.assessor,
						stage: d.stage,
						status: d.status,
						climate_id: climate?.id ?? null,
						floor_area: floorArea(d.els)
					})
					.returning('id');
				let position = 0;
				for (const spec of d.els) {
					const base = { organisation_id: org, dwelling_id: row.id, position: position++ };
					if (!Array.isArray(spec)) {
						await trx('elements').insert({
							...base,
							name: spec.name,
							kind: spec.kind,
							area: spec.area,
							heat_flow: 'horizontal',
							given_u: spec.givenU,
							given_u_source: spec.givenUSource
						});
						continue;
					}
					const [key, area] = spec;
					const c = C[key];
					const heatFlow = {
						'external-wall': 'horizontal',
						'pitched-roof-ceiling': 'upward',
						'flat-roof': 'upward',
						'ground-floor': 'downward',
						'exposed-floor': 'downward'
					}[c.kind];
					/** @type {Record<string, unknown> & { layers: unknown[] }} */
					const buildUp = { layers: c.layers.map(layer) };
					// Terraced houses about 7.5 m deep: the slab's exposed perimeter is the front and back walls.
					if (c.kind === 'ground-floor')
						buildUp.ground = { perimeterM: Math.round((2 * area * 10) / 7.5) / 10, areaM2: area };
					// A tiled roof with sarking felt over the loft (ISO 6946 roof-space resistance).
					if (c.kind === 'pitched-roof-ceiling') buildUp.roofSpace = 'tiles-with-felt-or-boards';
					const internal = { temperature: 20, humidityClass: c.humidityClass ?? 3 };
					const input = toElementInput({ heatFlow, buildUp, internal, area }, climate?.months ?? null);
					const result = physics.analyseElement(input);
					await trx('elements').insert({
						...base,
						name: c.name,
						kind: c.kind,
						area,
						heat_flow: heatFlow,
						build_up: JSON.stringify(buildUp),
						internal: JSON.stringify(internal),
						last_result: JSON.stringify(result),
						engine_version: physics.ENGINE_VERSION
					});
				}
			}
		}
	});
}
