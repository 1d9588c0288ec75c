// A regression guard for the material CSV import (preview and commit). `import.characterisation.json`
// beside this file is the import's own earlier output, recorded once from the code as it stood before
// its long functions were split into small ones: it is no outside reference, only proof that the same
// files still give the same previews, the same messages word for word, the same lines, the same order
// of problems and the same library afterwards. The behaviour itself is Envelo's own (common practice,
// no source); the data are invented.
//
// Every CSV under fixtures/ goes through a fresh organisation, and so do the files below, which reach
// the branches the fixtures do not (cell kinds, mappings given and saved, a library that already holds
// the codes, superseded materials).
import { describe, it, expect, afterAll } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { hasDatabase, makeTeam, tdb } from '../../factories';

const EXPECTED = JSON.parse(
	fs.readFileSync(path.resolve('tests/server/library/import.characterisation.json'), 'utf8')
) as { comment: string; results: Record<string, unknown> };

const TODAY = '2026-12-01';
const enc = (s: string) => new TextEncoder().encode(s);
const readFixture = (f: string) => new Uint8Array(fs.readFileSync(path.join('fixtures', f)));
const FULL =
	'code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes';
const SHORT = 'code,name,category,lambda,lambda_kind,source';

type Step = {
	csv: Uint8Array;
	mapping?: Record<string, string | null>;
	/** codes a supervisor marks superseded before this step */
	supersede?: string[];
};

function fixtureFiles(): string[] {
	return (fs.readdirSync('fixtures', { recursive: true }) as string[])
		.filter((f) => f.endsWith('.csv'))
		.map((f) => f.split(path.sep).join('/'))
		.sort();
}

const demoLines = new TextDecoder().decode(readFixture('materials/demo-library.csv')).split(/\r?\n/);
const demoRow = (code: string) => demoLines.find((l) => l.startsWith(`${code},`))!;

const CASES: [string, Step[]][] = [
	...fixtureFiles().map((f): [string, Step[]] => [`fixtures/${f}`, [{ csv: readFixture(f) }]]),
	[
		'cells of every kind',
		[
			{
				csv: enc(
					[
						FULL,
						'K-1,Board A,,Insulation,0.035,Declared by the manufacturer,,1,,,30,1030,20,300,Invented,1.6.2024,01.12.2030,Yes,',
						'K-2,Board B,Maker,INSULATION,0.035,design value,,1,1,,30,1030,,,Invented,2024-06-01,,x,note',
						'K-3,Board C,Maker,insulation,0.035,table,,1,,,30,1030,,,Invented,,,N,',
						'K-4,Board D,Maker,insulation,0.035,declared,,1,,,30,1030,,,Invented,,,maybe,',
						'K-5,Board E,Maker,insulation,abc,declared,xyz,1,,,30,1030,,,Invented,,,no,',
						'K-6,Board F,Maker,insulation,abc,,,1,,,30,1030,,,Invented,,,no,',
						'K-7,Board G,Maker,insulation,0.035,declared,,,wet,,30,1030,,,Invented,,,no,',
						'K-8,Board H,Maker,insulation,,,,1,,,30,1030,,,Invented,,,no,',
						'K-9,Board I,Maker,insulation,0.035,guessed,,1,,,30,1030,,,Invented,junk,31.02.2024,no,',
						"K-10,'=SUM(A1),Maker,insulation,0.035,declared,,1,,,30,1030,,,Invented,,,no,",
						'K-11,Board K,Maker,insulation,0.035,declared,,1,,,1200,1030,,,Invented,,2025-01-01,no,',
						'K-12,Board L,Maker,bricks,0.035,declared,0.5,1,,,30,1030,,,Invented,,,TRUE,',
						'K-13,Board M,Maker,insulation,0.035,declared,,1,,,30,1030,,,,,,false,',
						',Board N,Maker,insulation,0.035,declared,,1,,,30,1030,,,Invented,,,0,',
						'K-15,Board O,Maker,insulation,0.035,declared,,1,,,30,1030,,,Invented,,,1,,extra',
						'K-16,"Board, unquoted",Maker,insulation,0.035',
						'K-17',
						'K-18,Board R,Maker,air-layers,,,0.18,1,,,1.2,1000,,,Invented,,,no,',
						'K-19,Board S,Maker,membranes,,,,,,100,,,,,Invented,,,no,',
						'K-20,Board T,Maker,insulation,1.234.5,declared,,1.5,0.5,,-3,0,50,20,Invented,,,no,',
						'K-21,Board U,Maker,insulation,0.035,declared,,1,,,30,1030,,,Invented,2030-01-01,2020-01-01,no,'
					].join('\n') + '\n'
				)
			}
		]
	],
	[
		'semicolons, decimal commas, grouped thousands, CRLF and a BOM',
		[
			{
				csv: enc(
					'\uFEFF' +
						[
							'code;name;category;lambda;lambda_kind;density;specific_heat;source',
							'SC-1;Board;insulation;0,035;declared;1 200;1\u00a0030;Test',
							'SC-2;Board;insulation;.04;declared;30;1030;Test',
							'SC-3;Board;insulation;1.234,5;declared;30;1030;Test',
							'SC-4;Board;insulation;0,0,3;declared;30;1,030;Test',
							'SC-5;Board;insulation;0,04;declared;1 200;1030;Test'
						].join('\r\n') +
						'\r\n'
				)
			}
		]
	],
	[
		'semicolons with points only',
		[
			{
				csv: enc('code;name;category;lambda;lambda_kind;source\nSP-1;Board;insulation;0.035;declared;Test\n')
			}
		]
	],
	['line ends of CR alone', [{ csv: enc(`${SHORT}\rCR-1,Board,insulation,0.035,declared,Test\r`) }]],
	[
		'headers known by their other names',
		[
			{
				csv: enc(
					'Material code,Product name,Brand,Material group,Thermal conductivity (W/mK),Value kind,R-value,μ,μ wet,s_d,ρ [kg/m³],cp,Min thickness,Max thickness,Source document,Issue date,Valid until,Indicative,Remarks\n' +
						'AL-1,Board,Maker,insulation,0.035,declared,,1,1,,30,1030,10,200,Invented,2024-01-01,2030-01-01,no,none\n'
				)
			}
		]
	],
	[
		'unknown headers ask for a mapping',
		[{ csv: enc('Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle\nMP-1,Board,insulation,0.035,declared,Test\n') }]
	],
	[
		'one unknown header among known ones',
		[{ csv: enc(`${SHORT},Colour\nU-1,Board,insulation,0.035,declared,Test,red\n`) }]
	],
	[
		'a field named by two headers',
		[{ csv: enc('code,Code,name,category,lambda\nD-1,D-1,Board,insulation,0.035\n') }]
	],
	[
		'a blank header in the middle',
		[{ csv: enc('code,,name,category,lambda\nB-1,x,Board,insulation,0.035\n') }]
	],
	['blank headers at the end', [{ csv: enc('code,name,category,lambda,,\nB-2,Board,insulation,0.035,,\n') }]],
	['neither lambda nor resistance', [{ csv: enc('code,name,category,source\nN-1,Board,insulation,Test\n') }]],
	['required columns missing', [{ csv: enc('code,lambda\nN-2,0.035\n') }]],
	[
		'a header named like a built-in name',
		[{ csv: enc(`${SHORT},constructor\nK-1,Board,insulation,0.035,declared,Test,x\n`) }]
	],
	[
		'the code column last, short rows with and without it',
		[
			{
				csv: enc(
					'name,category,lambda,lambda_kind,code\nBoard,insulation,0.035,declared,L-1\nBoard,insulation\nBoard,insulation,0.035,declared,L-3,extra\n'
				)
			}
		]
	],
	[
		'duplicate codes, valid and invalid rows, three times',
		[
			{
				csv: enc(
					`${SHORT}\nDU-1,Board,insulation,0.035,declared,Test\nDU-1,Board,insulation,x,declared,Test\nDU-2,Board,insulation,0.035,declared,Test\nDU-1,Board,insulation,0.036,declared,Test\nDU-3,Board\nDU-3,Board,insulation,0.035,declared,Test\n`
				)
			}
		]
	],
	[
		'a mapping given: complete, with a column ignored',
		[
			{
				csv: enc(
					'Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle,Farbe\nMG-1,Board,insulation,0.035,declared,Test,red\n'
				),
				mapping: {
					Artikel: 'code',
					Bezeichnung: 'name',
					Gruppe: 'category',
					WLF: 'lambda',
					Art: 'lambdaKind',
					Quelle: 'source',
					Farbe: null
				}
			}
		]
	],
	[
		'a mapping given: incomplete, a field twice, a field that does not exist',
		[
			{
				csv: enc('Artikel,Bezeichnung,Gruppe,WLF\nMG-2,Board,insulation,0.035\n'),
				mapping: { Artikel: 'code', Bezeichnung: 'code', Gruppe: 'colour', Other: 'name' }
			}
		]
	],
	[
		'a mapping given, saved, then found for the same header spelt otherwise',
		[
			{
				csv: enc('Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle\nMS-1,Board,insulation,0.035,declared,Test\n'),
				mapping: {
					Artikel: 'code',
					Bezeichnung: 'name',
					Gruppe: 'category',
					WLF: 'lambda',
					Art: 'lambdaKind',
					Quelle: 'source'
				}
			},
			{ csv: enc('Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle\nMS-2,Board,insulation,0.035,declared,Test\n') },
			{
				csv: enc(
					'ARTIKEL,bezeichnung,Gruppe (Kategorie),WLF [W/mK],art,QUELLE\nMS-3,Board,insulation,0.035,declared,Test\nMS-1,Board renamed,insulation,0.035,declared,Test\n'
				)
			},
			{
				csv: enc('Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle\nMS-4,Board,insulation,0.035,declared,Test\n'),
				mapping: {
					Artikel: 'code',
					Bezeichnung: 'name',
					Gruppe: 'category',
					WLF: 'lambda',
					Art: null,
					Quelle: 'notes'
				}
			}
		]
	],
	[
		'the demo library, then a file that changes, keeps and adds, with superseded materials',
		[
			{ csv: readFixture('materials/demo-library.csv') },
			{
				supersede: ['G-INS-EPS-036', 'G-INS-XPS-034'],
				csv: enc(
					[
						demoLines[0],
						demoRow('G-INS-GLW-035').replace(',0.035,', ',0.034,'),
						demoRow('G-INS-RKW-036'),
						demoRow('G-INS-EPS-036').replace('Expanded polystyrene (EPS)', 'EPS board'),
						demoRow('G-INS-XPS-034'),
						demoRow('G-INS-PIR-022').replace(',32,', ',320,'),
						'NEW-1,New board,generic,insulation,0.03,declared,,1,,,30,1030,,,Invented,,,no,',
						demoRow('G-INS-PF-020').replace(',0.02,', ',zero,')
					].join('\n') + '\n'
				)
			}
		]
	]
];

type Outcome = Record<string, unknown>;

/** A thrown refusal as its class, status, message and answer. */
function refusal(e: unknown): Outcome {
	if (e instanceof Error) {
		const x = e as Error & { status?: unknown; extra?: unknown };
		return { threw: x.name, status: x.status ?? null, message: x.message, extra: x.extra ?? null };
	}
	return { threw: String(e) };
}

const TOKEN = /^[0-9a-f]{64}$/;

describe.skipIf(!hasDatabase)('material CSV import: the same results as recorded', async () => {
	const imp = await import('../../../src/lib/server/library/import');
	const lib = await import('../../../src/lib/server/library');
	const { db } = await import('../../../src/lib/server/db');
	afterAll(async () => {
		const { authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	async function run(steps: Step[]): Promise<Outcome> {
		const t = await makeTeam();
		const actor = { userId: t.assessor.id, organisationId: t.org.id };
		const logged: Outcome[] = [];
		const log = async (entry: {
			action: string;
			entity: string;
			entityId: string | null;
			details: unknown;
		}) => {
			logged.push({
				action: entry.action,
				entity: entry.entity,
				entityId: entry.entityId,
				details: entry.details
			});
		};
		const out: Outcome[] = [];
		for (const step of steps) {
			for (const code of step.supersede ?? []) {
				const m = await tdb()('materials').where({ organisation_id: t.org.id, code }).first('id');
				await lib.setMaterialStatus({ userId: t.supervisor.id, organisationId: t.org.id }, m.id, 'supersede');
			}
			const mapping = step.mapping as never;
			const record: Outcome = {};
			let token = 'not-a-preview';
			try {
				const p = await imp.previewMaterialsImport(db, t.org.id, step.csv, { mapping, today: TODAY });
				if (p.kind === 'preview') {
					expect(p.token).toMatch(TOKEN);
					token = p.token;
					// each row's numbers as read were added after the recording (checked in import.test.ts)
					const rows = p.rows.map(({ read: _read, ...row }) => row);
					record.preview = { ...p, rows, token: '<token>' };
				} else record.preview = p;
			} catch (e) {
				record.preview = refusal(e);
			}
			// First from the kept preview, without confirming warnings; then, should that be refused, from
			// the file read again (nothing kept), confirming them.
			try {
				record.commit = await imp.commitMaterialsImport(db, actor, null, { token, today: TODAY }, log);
			} catch (e) {
				record.commit = refusal(e);
				imp.forgetKeptPreviews();
				try {
					record.commitAgain = await imp.commitMaterialsImport(
						db,
						actor,
						step.csv,
						{ token, mapping, today: TODAY, confirmWarnings: true },
						log
					);
				} catch (e2) {
					record.commitAgain = refusal(e2);
				}
			}
			out.push(record);
		}
		const mappings = await tdb()('import_mappings')
			.where({ organisation_id: t.org.id })
			.orderBy('header_signature')
			.select('kind', 'header_signature', 'mapping');
		return { steps: out, log: logged, library: await lib.listAllCurrent(t.org.id), mappings };
	}

	it('reads the same set of inputs as were recorded', () => {
		expect(CASES.map(([name]) => name).sort()).toEqual(Object.keys(EXPECTED.results).sort());
	});
	for (const [name, steps] of CASES) {
		it(name, async () => {
			const got = JSON.parse(JSON.stringify(await run(steps)));
			expect(got).toEqual(EXPECTED.results[name]);
		});
	}
});
