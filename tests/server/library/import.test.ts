import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb } from '../../factories';
import { boardValues, fixture, generatedCsv, librarySnapshot } from '../../factories-library';
import { ValidationError } from '../../../src/lib/server/errors';

// The CSV import and export against a real PostgreSQL. The behaviour checked is our own (common
// practice, no source) unless a document is named beside the check. Every bad file gets its specific
// message, and the library is unchanged after a preview and after an attempted commit.
describe.skipIf(!hasDatabase)('material library CSV', async () => {
	const imp = await import('../../../src/lib/server/library/import');
	const lib = await import('../../../src/lib/server/library');
	const { db } = await import('../../../src/lib/server/db');
	const enc = (s: string) => new TextEncoder().encode(s);
	afterAll(async () => {
		const { authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	async function preview(orgId: string, bytes: Uint8Array, mapping?: Record<string, string | null>) {
		return imp.previewMaterialsImport(db, orgId, bytes, { mapping: mapping as never, today: '2026-12-01' });
	}
	const { logActivity } = await import('../../../src/lib/server/activity');
	async function commit(
		t: Awaited<ReturnType<typeof makeTeam>>,
		bytes: Uint8Array,
		token: string,
		extra: Record<string, unknown> = {}
	) {
		return imp.commitMaterialsImport(
			db,
			{ userId: t.assessor.id, organisationId: t.org.id },
			bytes,
			{ token, today: '2026-12-01', ...extra },
			logActivity
		);
	}
	const issues = (p: Awaited<ReturnType<typeof preview>>) => {
		if (p.kind !== 'preview') throw new Error('expected a preview');
		return p.rows.map(
			(r) =>
				`line ${r.line}: ${r.status}` +
				r.errors.map((e) => ` | ${e.column ? `${e.column}: ` : ''}${e.message}`).join('')
		);
	};

	it('imports the demo library: 44 new materials, then the same file again is all unchanged', async () => {
		const t = await makeTeam();
		const bytes = fixture('materials/demo-library.csv');
		const p = await preview(t.org.id, bytes);
		if (p.kind !== 'preview') throw new Error(p.message);
		expect(p.counts).toEqual({ new: 44, changed: 0, unchanged: 0, rejected: 0, warnings: 0 });
		expect(p.file).toMatchObject({ delimiter: ',', decimal: '.', bom: false, rows: 44 });
		const s = await commit(t, bytes, p.token);
		expect(s).toEqual({ added: 44, changed: 0, unchanged: 0, rejected: 0, mappingSaved: false });
		const again = await preview(t.org.id, bytes);
		expect(again.kind === 'preview' && again.counts).toMatchObject({ new: 0, unchanged: 44 });
		const row = await lib.listMaterials(t.org.id, { q: 'G-INS-EPS-036', page: 1, pageSize: 5, sort: 'code' });
		expect(row.items[0]).toMatchObject({
			lambda: 0.036,
			muDry: 60,
			category: 'insulation',
			status: 'unverified'
		});
		const log = await tdb()('activity_log').where({ organisation_id: t.org.id, action: 'import' }).first();
		expect(log.details).toMatchObject({ added: 44 });
	});

	it('round trip: export then import reports everything unchanged', async () => {
		const t = await makeTeam();
		const bytes = fixture('materials/demo-library.csv');
		const p = await preview(t.org.id, bytes);
		await commit(t, bytes, (p as { token: string }).token);
		// A value with a comma, quotes and a date, and a material created through the API.
		await lib.createMaterial(
			{ userId: t.assessor.id, organisationId: t.org.id },
			{
				code: 'RT-1',
				name: 'Board, "special"',
				category: 'insulation',
				lambda: 0.0315,
				lambdaKind: 'declared',
				muDry: 1.5,
				source: 'Declaration of performance DoP-77',
				sourceIssued: '2025-03-01',
				sourceExpires: '2030-02-28',
				notes: 'line one; line two'
			}
		);
		const csv = imp.materialsToCsv(await lib.listAllCurrent(t.org.id));
		expect(csv.startsWith('\uFEFFcode,name,')).toBe(true);
		// a material without a manufacturer is written with the manufacturer left blank, not "generic"
		const lines = csv.split('\r\n');
		const col = lines[0].replace('\uFEFF', '').split(',').indexOf('manufacturer');
		expect(
			lines
				.slice(1)
				.filter(Boolean)
				.every((l) => !/(^|,)generic(,|$)/.test(l))
		).toBe(true);
		expect(col).toBeGreaterThan(0);
		const back = await preview(t.org.id, enc(csv));
		if (back.kind !== 'preview') throw new Error(back.message);
		expect(back.counts).toEqual({ new: 0, changed: 0, unchanged: 45, rejected: 0, warnings: 0 });
		expect(back.file.bom).toBe(true);
	});

	it('the export neutralises cells that a spreadsheet would run as formulas', async () => {
		const { toCsv, neutralise } = await import('../../../src/lib/server/csv/write');
		// OWASP "CSV Injection": =, +, -, @, tab and CR at the start of a cell.
		for (const c of ['=1+1', '+1', '-1+2', '@SUM(A1)', '\t=1', '\r=1']) expect(neutralise(c)).toBe(`'${c}`);
		expect(neutralise(-5)).toBe('-5');
		expect(toCsv(['a'], [['=cmd|calc']], { bom: false })).toBe("a\r\n'=cmd|calc\r\n");
	});

	it('reads semicolons, decimal commas, a BOM and quoted fields', async () => {
		const t = await makeTeam();
		const text =
			'\uFEFFcode;name;category;lambda;lambda_kind;density;source\r\n' +
			'SC-1;"Board; with a semicolon";insulation;0,035;declared;1 200;"Test, invented"\r\n' +
			'SC-2;"Board ""quoted""";Insulation;.04;Declared by the manufacturer;30;Test\r\n';
		const p = await preview(t.org.id, enc(text));
		if (p.kind !== 'preview') throw new Error(p.message);
		expect(p.file).toMatchObject({ delimiter: ';', decimal: ',', bom: true });
		expect(issues(p)).toEqual(['line 2: new', 'line 3: new']);
		expect(p.rows[0].warnings.map((w) => w.column)).toEqual(['density']); // 1200 kg/m³ insulation: unusual
		// the preview shows the numbers as read: "0,035" became 0.035 and "1 200" 1200
		expect(p.rows[0].read).toEqual({ lambda: 0.035, density: 1200 });
		expect(p.rows[1].read).toEqual({ lambda: 0.04, density: 30 });
		await expect(commit(t, enc(text), p.token)).rejects.toThrow(/1 row has warnings; confirm/);
		expect(await commit(t, enc(text), p.token, { confirmWarnings: true })).toMatchObject({ added: 2 });
		const r = await lib.listMaterials(t.org.id, { q: 'SC-', page: 1, pageSize: 5, sort: 'code' });
		expect(r.items.map((i) => [i.name, i.lambda, i.density])).toEqual([
			['Board; with a semicolon', 0.035, 1200],
			['Board "quoted"', 0.04, 30]
		]);
	});

	it('shows changed rows with old → new values and writes them as new revisions', async () => {
		const t = await makeTeam();
		const head = 'code,name,category,lambda,lambda_kind,source\n';
		const first = enc(
			head + 'CH-1,Board,insulation,0.035,declared,Test\nCH-2,Other,insulation,0.04,declared,Test\n'
		);
		const p1 = await preview(t.org.id, first);
		await commit(t, first, (p1 as { token: string }).token);
		const second = enc(
			head +
				'CH-1,Board,insulation,0.032,declared,Test\nCH-2,Other,insulation,0.04,declared,Test\nCH-3,New,insulation,0.03,declared,Test\n'
		);
		const p2 = await preview(t.org.id, second);
		if (p2.kind !== 'preview') throw new Error(p2.message);
		expect(p2.rows.map((r) => r.status)).toEqual(['changed', 'unchanged', 'new']);
		expect(p2.rows[0].changes).toEqual([{ field: 'lambda', from: 0.035, to: 0.032 }]);
		// The library changed after the preview: the commit refuses the stale preview.
		const m = (await lib.listMaterials(t.org.id, { q: 'CH-2', page: 1, pageSize: 1, sort: 'code' })).items[0];
		await lib.updateMaterial({ userId: t.admin.id, organisationId: t.org.id }, m.id, {
			name: 'Other',
			category: 'insulation',
			lambda: 0.041,
			lambdaKind: 'declared',
			source: 'Test'
		});
		const before = await librarySnapshot(t.org.id);
		await expect(commit(t, second, p2.token)).rejects.toThrow(/changed since the preview/);
		expect(await librarySnapshot(t.org.id)).toBe(before);
		const p3 = await preview(t.org.id, second);
		expect(await commit(t, second, (p3 as { token: string }).token)).toEqual({
			added: 1,
			changed: 2,
			unchanged: 0,
			rejected: 0,
			mappingSaved: false
		});
		const ch1 = (await lib.listMaterials(t.org.id, { q: 'CH-1', page: 1, pageSize: 1, sort: 'code' }))
			.items[0];
		expect([ch1.revision, ch1.lambda]).toEqual([2, 0.032]);
	});

	it('asks for a mapping when headers are unknown and remembers it', async () => {
		const t = await makeTeam();
		const text = enc(
			'Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle\nMP-1,Board,insulation,0.035,declared,Test\n'
		);
		const p = await preview(t.org.id, text);
		expect(p.kind).toBe('mapping');
		if (p.kind !== 'mapping') return;
		expect(p.message).toMatch(/'Artikel', 'Bezeichnung'/);
		expect(p.problems[0]).toMatch(/required columns missing: code, name, category, lambda or resistance/);
		const mapping = {
			Artikel: 'code',
			Bezeichnung: 'name',
			Gruppe: 'category',
			WLF: 'lambda',
			Art: 'lambdaKind',
			Quelle: 'source'
		};
		const bad = await preview(t.org.id, text, { ...mapping, Bezeichnung: 'code' });
		expect(bad.kind === 'mapping' && bad.problems.join()).toMatch(/'code' is given by two columns/);
		const ok = await preview(t.org.id, text, mapping);
		if (ok.kind !== 'preview') throw new Error(ok.message);
		expect(ok.counts.new).toBe(1);
		expect(await commit(t, text, ok.token, { mapping })).toMatchObject({ added: 1, mappingSaved: true });
		const next = await preview(
			t.org.id,
			enc('Artikel,Bezeichnung,Gruppe,WLF,Art,Quelle\nMP-2,Board,insulation,0.035,declared,Test\n')
		);
		expect(next.kind === 'preview' && next.mappingSource).toBe('saved');
		// The same header spelt otherwise (case, units in brackets) finds the saved mapping too.
		const respelt = await preview(
			t.org.id,
			enc(
				'ARTIKEL,bezeichnung,Gruppe (Kategorie),WLF [W/mK],art,QUELLE\nMP-3,Board,insulation,0.035,declared,Test\n'
			)
		);
		if (respelt.kind !== 'preview') throw new Error(respelt.message);
		expect(respelt.mappingSource).toBe('saved');
		expect(respelt.counts.new).toBe(1);
	});

	const large = () => {
		const line =
			'X-1,Board,generic,insulation,0.035,declared,,1,,,30,1000,,,Invented,,,no,' + 'x'.repeat(200) + '\n';
		return enc(
			'code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes\n' +
				line.repeat(Math.ceil((10.5 * 1024 * 1024) / line.length))
		);
	};

	// file → a part of the message it must give (file-level) or of the row issues (row-level)
	const corpus: [string, RegExp | string[]][] = [
		['bad-csv/wrong-delimiter.csv', /Line 1 separates its columns with tabs/],
		['bad-csv/missing-column.csv', /Line 1: required column missing: name/],
		[
			'bad-csv/text-in-number.csv',
			[
				"line 2: rejected | lambda: 'O.035' is not a number",
				"line 3: rejected | density: 'thirty' is not a number",
				"line 4: rejected | lambda: '0,035' is not a number here: a decimal comma needs a semicolon-separated file (or write 0.035)"
			]
		],
		[
			'bad-csv/negative-zero.csv',
			[
				'line 2: rejected | lambda: must be greater than 0 W/(m·K)',
				'line 3: rejected | lambda: must be greater than 0 W/(m·K)',
				'line 4: rejected | density: must be greater than 0 kg/m³',
				'line 5: rejected | mu_dry: must be at least 1 (still air has μ = 1)'
			]
		],
		[
			'bad-csv/duplicate-codes.csv',
			[
				"line 2: rejected | code: code 'BAD-D1' appears on lines 2, 4; keep one of them",
				"line 3: rejected | code: code 'BAD-D2' appears on lines 3, 5; keep one of them",
				"line 4: rejected | code: code 'BAD-D1' appears on lines 2, 4; keep one of them",
				"line 5: rejected | code: code 'BAD-D2' appears on lines 3, 5; keep one of them"
			]
		],
		[
			'bad-csv/truncated-last-line.csv',
			/Line 4, the last line, has 4 of 19 columns and no line end: the file looks cut short/
		],
		['bad-csv/empty.csv', /The file is empty/],
		['bad-csv/header-only.csv', /a header line but no data rows/],
		['bad-csv/latin1.csv', /not UTF-8 text: line 2 has the byte 0xE2 \(in Latin-1 that byte is 'â'\)/],
		[
			'bad-csv/formula-cells.csv',
			[
				'line 2: rejected | name: begins with =, +, - or @ and would run as a spreadsheet formula; remove that first character',
				'line 3: rejected | name: begins with =, +, - or @ and would run as a spreadsheet formula; remove that first character',
				'line 4: rejected | name: begins with =, +, - or @ and would run as a spreadsheet formula; remove that first character',
				'line 5: rejected | name: begins with =, +, - or @ and would run as a spreadsheet formula; remove that first character'
			]
		],
		[
			'bad-csv/thickness-range.csv',
			[
				'line 2: rejected | thickness_max_mm: thickness range max below min',
				'line 3: rejected | thickness_max_mm: thickness range max below min'
			]
		],
		[
			'bad-csv/unknown-category.csv',
			[
				'line 2: rejected | category: must be one of: masonry, concrete, timber-boards, insulation, membranes, plasters-linings, air-layers, other',
				'line 3: rejected | category: must be one of: masonry, concrete, timber-boards, insulation, membranes, plasters-linings, air-layers, other'
			]
		],
		['bad-csv/binary.csv', /binary file, not CSV text/],
		['bad-csv/unclosed-quote.csv', /Line 2 opens a quoted field that is never closed/],
		['(generated) large.csv', /The file is 10\.5 MB; the limit is 10\.0 MB/]
	];

	for (const [file, expected] of corpus) {
		it(`refuses ${file} with its own message and leaves the library unchanged`, async () => {
			const t = await makeTeam();
			const bytes = file.startsWith('(generated)') ? large() : fixture(file);
			const before = await librarySnapshot(t.org.id);
			if (expected instanceof RegExp) {
				await expect(preview(t.org.id, bytes)).rejects.toThrow(expected);
				await expect(commit(t, bytes, 'any', { confirmWarnings: true })).rejects.toThrow(expected);
			} else {
				const p = await preview(t.org.id, bytes);
				const got = issues(p);
				expect(got).toEqual(expected);
				expect(
					await commit(t, bytes, (p as { token: string }).token, { confirmWarnings: true })
				).toMatchObject({ added: 0, changed: 0, rejected: expected.length });
			}
			expect(await librarySnapshot(t.org.id)).toBe(before);
		});
	}

	it('a short row in the middle is rejected with its line; rows around it are kept', async () => {
		const t = await makeTeam();
		const p = await preview(
			t.org.id,
			enc(
				'code,name,category,lambda,lambda_kind,source\nS-1,Board,insulation,0.035,declared,Test\nS-2,Board\nS-3,Board,insulation,0.035,declared,Test\n'
			)
		);
		expect(issues(p)).toEqual([
			'line 2: new',
			"line 3: rejected | the row for 'S-2' has 2 cells but the header has 6 columns; check for a missing or extra separator",
			'line 4: new'
		]);
	});

	it('keeps backslashes, tabs and line breaks in text exactly as written (bulk write escaping)', async () => {
		// PostgreSQL 15 documentation, COPY, "Text Format": backslash, tab, newline and carriage return
		// must be escaped in the data; \N is null.
		const t = await makeTeam();
		const notes = 'C:\\data\\λ.pdf\tpage 2\r\nsecond line \\N not null';
		const csv =
			'code,name,category,lambda,lambda_kind,source,notes\n' +
			`ESC-1,"Board \\ with\ttab",insulation,0.035,declared,Test,"${notes}"\n`;
		const bytes = enc(csv);
		const p = await preview(t.org.id, bytes);
		if (p.kind !== 'preview') throw new Error(p.message);
		expect(p.counts.new).toBe(1);
		await commit(t, bytes, p.token);
		const row = await tdb()('material_revisions as r')
			.join('materials as m', 'm.current_revision_id', 'r.id')
			.where({ 'm.organisation_id': t.org.id, 'm.code': 'ESC-1' })
			.first('r.name', 'r.notes', 'r.resistance', 'r.indicative');
		expect(row).toEqual({
			name: 'Board \\ with\ttab',
			notes,
			resistance: null,
			indicative: false
		});
	});

	it("treats a header named like a built-in name ('constructor', 'toString') as any unknown column", async () => {
		const t = await makeTeam();
		const p = await preview(
			t.org.id,
			enc(
				'code,name,category,lambda,lambda_kind,Constructor,toString\nK-1,Board,insulation,0.035,declared,x,y\n'
			)
		);
		expect(p.kind).toBe('mapping');
		if (p.kind !== 'mapping') return;
		expect(p.message).toMatch(/does not know these columns: 'Constructor', 'toString'/);
		expect(p.suggested).toMatchObject({ Constructor: null, toString: null, code: 'code' });
	});

	it('refuses an invisible control character in text with the field named (PostgreSQL stores no zero byte)', async () => {
		const t = await makeTeam();
		const err = await lib
			.createMaterial(
				{ userId: t.assessor.id, organisationId: t.org.id },
				{ code: 'NUL-1', name: 'Board\u0000', category: 'insulation', lambda: 0.035, lambdaKind: 'declared' },
				{ confirmWarnings: true }
			)
			.catch((e) => e);
		expect(err).toBeInstanceOf(ValidationError);
		expect(err.status).toBe(400);
		expect(err.issues).toContainEqual({
			path: 'name',
			field: 'name',
			message: expect.stringMatching(/invisible control character/)
		});
	});

	it('refuses a date the database cannot hold, at the preview, with the column named', async () => {
		const t = await makeTeam();
		const p = await preview(
			t.org.id,
			enc(
				'code,name,category,lambda,lambda_kind,source,source_issued\nD-1,Board,insulation,0.035,declared,Test,0000-06-01\nD-2,Board,insulation,0.035,declared,Test,1.6.2024\n'
			)
		);
		expect(issues(p)).toEqual([
			'line 2: rejected | source_issued: must be a date between the years 1900 and 2200',
			'line 3: new'
		]);
	});

	it('a header cell with a line break in it (as spreadsheets write) stays one column', async () => {
		const t = await makeTeam();
		const p = await preview(
			t.org.id,
			enc(
				'code,name,category,"lambda\n(W/mK)",lambda_kind,source\nH-1,Board,insulation,0.035,declared,Test\n'
			)
		);
		if (p.kind !== 'preview') throw new Error(p.message);
		expect(p.file.headers).toEqual(['code', 'name', 'category', 'lambda\n(W/mK)', 'lambda_kind', 'source']);
		expect(issues(p)).toEqual(['line 3: new']);
	});

	it('changing a superseded material asks for confirmation; a status change after the preview refuses the commit', async () => {
		const t = await makeTeam();
		const actor = { userId: t.assessor.id, organisationId: t.org.id };
		const supervisor = { userId: t.supervisor.id, organisationId: t.org.id };
		const head = 'code,name,category,lambda,lambda_kind,mu_dry,density,specific_heat,source\n';
		const a = await lib.createMaterial(actor, boardValues({ code: 'SUP-1' }), { confirmWarnings: true });
		const b = await lib.createMaterial(actor, boardValues({ code: 'SUP-2' }), { confirmWarnings: true });
		await lib.setMaterialStatus(supervisor, a.id, 'supersede');
		const file = enc(
			head +
				'SUP-1,Board corrected,insulation,0.035,declared,1,30,1030,Invented\n' +
				'SUP-2,Board corrected,insulation,0.035,declared,1,30,1030,Invented\n'
		);
		const p = await preview(t.org.id, file);
		if (p.kind !== 'preview') throw new Error(p.message);
		expect(p.rows[0].warnings.map((w) => w.message)).toContainEqual(
			expect.stringMatching(
				/marks this material superseded .* importing makes a new, unverified revision current/
			)
		);
		expect(p.counts.warnings).toBeGreaterThanOrEqual(1);
		await expect(commit(t, file, p.token)).rejects.toThrow(/warnings; confirm them to import/);
		// Meanwhile a supervisor verifies SUP-2: the preview no longer shows the library as it is.
		await lib.setMaterialStatus(supervisor, b.id, 'verify');
		const before = await librarySnapshot(t.org.id);
		await expect(commit(t, file, p.token, { confirmWarnings: true })).rejects.toThrow(
			/changed since the preview/
		);
		expect(await librarySnapshot(t.org.id)).toBe(before);
	});

	it('2,000 generated rows preview and commit in one go', async () => {
		const t = await makeTeam();
		const bytes = enc(generatedCsv(2000));
		const p = await preview(t.org.id, bytes);
		if (p.kind !== 'preview') throw new Error(p.message);
		expect(p.counts.new).toBe(2000);
		expect(await commit(t, bytes, p.token)).toMatchObject({ added: 2000 });
		expect(
			Number((await tdb()('materials').where({ organisation_id: t.org.id }).count({ n: '*' }))[0].n)
		).toBe(2000);
	});
});
