// Reading a CSV upload as a stream (src/lib/server/csv/read.ts). The reference for the records is
// papaparse 5 itself (a general-purpose CSV library from npm) parsing the whole text in one call; the
// reference for line numbers is counting line ends in the text by hand. Whatever the chunk size, and
// wherever a chunk boundary falls (inside a multi-byte character, between \r and \n, inside a quoted
// field), the streamed reader must give the same records on the same lines, and refuse a bad file
// with the same message as when it arrives in one piece. No database needed.
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { readCsvStream, type ByteSource } from '../../../src/lib/server/csv/read';
import { fixture } from '../../factories-library';

const enc = (s: string) => new TextEncoder().encode(s);

async function* inChunks(bytes: Uint8Array, size: number) {
	for (let i = 0; i < bytes.length; i += size) yield bytes.slice(i, i + size);
}

async function read(source: ByteSource) {
	const rows: { line: number; cells: string[] }[] = [];
	let header: string[] = [];
	const file = await readCsvStream(
		source,
		{},
		(h) => {
			header = h;
		},
		(cells, line) => rows.push({ line, cells })
	);
	return { header, rows, file };
}

/** What the reader must give: papaparse on the whole text, with each record's first line counted by hand. */
function reference(text: string) {
	const body = text.replace(/^\uFEFF/, '');
	const records = Papa.parse<string[]>(body, { skipEmptyLines: true }).data;
	// The first line of each record: walk the text, skipping quoted sections.
	const starts: number[] = [];
	let line = 1;
	let inQuotes = false;
	let atStart = true;
	for (let i = 0; i < body.length; i++) {
		const c = body[i];
		if (atStart && c !== '\n' && c !== '\r') {
			starts.push(line);
			atStart = false;
		}
		if (c === '"') inQuotes = !inQuotes;
		if (c === '\n') {
			line++;
			if (!inQuotes) atStart = true;
		}
	}
	return records.slice(1).map((cells, i) => ({ line: starts[i + 1], cells }));
}

const awkward =
	'\uFEFFcode,name,notes\r\n' +
	'A-1,"Mineral wool, λ 0.035","two\r\nlines"\r\n' +
	'\r\n' +
	'A-2,Dämmplatte μ 1,"quote "" inside"\r\n' +
	'A-3,Holzfaser 𝜆 (a four-byte letter),\r\n' +
	'A-4,"ends\nwith a bare newline inside",x\r\n';

describe('reading a CSV upload as a stream', () => {
	for (const size of [1, 2, 3, 5, 7, 64, 65536]) {
		it(`gives papaparse's records on the right lines in chunks of ${size} bytes`, async () => {
			const got = await read(inChunks(enc(awkward), size));
			expect(got.header).toEqual(['code', 'name', 'notes']);
			expect(got.rows).toEqual(reference(awkward));
			expect(got.rows.map((r) => r.line)).toEqual([2, 5, 6, 7]);
			expect(got.file).toMatchObject({ bom: true, delimiter: ',', rows: 4 });
		});
	}

	it('reads the demo library in 1-byte and 64 KB chunks alike, as papaparse reads it whole', async () => {
		const bytes = fixture('materials/demo-library.csv');
		const text = new TextDecoder().decode(bytes);
		const whole = await read(bytes);
		const bytewise = await read(inChunks(bytes, 1));
		expect(whole.rows).toEqual(reference(text));
		expect(bytewise.rows).toEqual(whole.rows);
		expect(bytewise.file.sha256).toBe(whole.file.sha256);
		expect(whole.file.rows).toBe(44);
	});

	it('takes the line end from the header line, not from a quoted field further on', async () => {
		const text = 'code,notes\nN-1,"a\r\nb"\nN-2,plain\n';
		const got = await read(inChunks(enc(text), 64));
		expect(got.rows).toEqual(reference(text));
		expect(got.rows.map((r) => r.line)).toEqual([2, 4]);
	});

	it('takes a semicolon-separated file', async () => {
		const got = await read(inChunks(enc('code;name;lambda\nB-1;Board;0,035\n'), 4));
		expect(got.file.delimiter).toBe(';');
		expect(got.rows).toEqual([{ line: 2, cells: ['B-1', 'Board', '0,035'] }]);
	});

	const bad: [string, RegExp][] = [
		['bad-csv/latin1.csv', /not UTF-8 text: line 2 has the byte 0xE2 \(in Latin-1 that byte is 'â'\)/],
		['bad-csv/binary.csv', /binary file, not CSV text/],
		['bad-csv/empty.csv', /The file is empty/],
		['bad-csv/header-only.csv', /a header line but no data rows/],
		['bad-csv/wrong-delimiter.csv', /Line 1 separates its columns with tabs/],
		[
			'bad-csv/truncated-last-line.csv',
			/Line 4, the last line, has 4 of 19 columns and no line end: the file looks cut short/
		],
		['bad-csv/unclosed-quote.csv', /Line 2 opens a quoted field that is never closed/]
	];
	for (const [file, message] of bad) {
		it(`refuses ${file} with the same message whole and byte by byte`, async () => {
			const bytes = fixture(file);
			await expect(read(bytes)).rejects.toThrow(message);
			await expect(read(inChunks(bytes, 1))).rejects.toThrow(message);
			await expect(read(inChunks(bytes, 3))).rejects.toThrow(message);
		});
	}

	it('places a bad byte after a multi-byte character split across chunks', async () => {
		// 'λ' is 0xCE 0xBB in UTF-8; the lone 0xE9 on line 3 is 'é' in Latin-1.
		const bytes = new Uint8Array([...enc('code,name\nA-1,λ board\nA-2,caf'), 0xe9, ...enc(',x\n')]);
		for (const size of [1, 2, 3, 4, 64]) {
			await expect(read(inChunks(bytes, size))).rejects.toThrow(/line 3 has the byte 0xE9/);
		}
	});

	it('refuses a file that ends inside a multi-byte character', async () => {
		const bytes = new Uint8Array([...enc('code,name\nA-1,board '), 0xce]);
		await expect(read(inChunks(bytes, 5))).rejects.toThrow(/line 2 has the byte 0xCE/);
	});

	it('refuses an over-size stream as soon as it passes the limit, without reading the rest', async () => {
		const line = enc('X-1,Board,' + 'x'.repeat(1000) + '\n');
		let pulled = 0;
		async function* big() {
			yield enc('code,name,notes\n');
			for (let i = 0; i < 2200; i++) {
				pulled++;
				yield line; // about 2.1 MB in all
			}
		}
		const none = () => {};
		await expect(readCsvStream(big(), { maxBytes: 1024 * 1024 }, none, none)).rejects.toThrow(
			/The file is larger than 1\.0 MB, the limit/
		);
		expect(pulled).toBeLessThan(1100);
		// When the sender declares the size, the message gives it, before anything is read.
		pulled = 0;
		await expect(
			readCsvStream(big(), { maxBytes: 1024 * 1024, size: 2.1 * 1024 * 1024 }, none, none)
		).rejects.toThrow(/The file is 2\.1 MB; the limit is 1\.0 MB/);
		expect(pulled).toBe(0);
	});

	it('refuses a quoted field that never closes once the row passes 256 kB, without reading on', async () => {
		let pulled = 0;
		async function* open() {
			yield enc('code,name,notes\nQ-1,Board,"an opening quote and then\n');
			for (let i = 0; i < 10_000; i++) {
				pulled++;
				yield enc('more text of the same never-ending field, on and on\n');
			}
		}
		await expect(
			readCsvStream(
				open(),
				{},
				() => {},
				() => {}
			)
		).rejects.toThrow(
			/Line 2: one row runs on past 256 kB of text, most likely because a quoted field is never closed/
		);
		expect(pulled).toBeLessThan(6000);
	});

	it('refuses a first line with no line end within 64 kB, without reading on', async () => {
		let pulled = 0;
		async function* noLines() {
			for (let i = 0; i < 10_000; i++) {
				pulled++;
				yield enc('a,b,c,d,e,f,g,h,'.repeat(64));
			}
		}
		await expect(
			readCsvStream(
				noLines(),
				{},
				() => {},
				() => {}
			)
		).rejects.toThrow(/Line 1 has no line end within its first 64 kB/);
		expect(pulled).toBeLessThan(100);
	});

	it('places a bad byte on the right line in a file whose lines end with CR alone', async () => {
		const bytes = new Uint8Array([...enc('code,name\rA,b\rB,b\rC,b\rD,'), 0x8a, ...enc('\r')]);
		for (const size of [1, 3, 64]) {
			await expect(read(inChunks(bytes, size))).rejects.toThrow(/line 5 has the byte 0x8A/);
		}
		const nul = new Uint8Array([...enc('code,name\r\nA,b\rB,'), 0x00]);
		await expect(read(inChunks(nul, 2))).rejects.toThrow(/a zero byte at line 3/);
	});

	it('says line 1 is blank however many blank lines come first', async () => {
		const blanks = enc('\n'.repeat(200_000) + 'code,name\nA-1,Board\n');
		await expect(read(inChunks(blanks, 64 * 1024))).rejects.toThrow(/Line 1 is blank/);
		await expect(read(inChunks(enc('\r\n'.repeat(100_000)), 64 * 1024))).rejects.toThrow(/only blank lines/);
	});

	it('names a file that mixes CR LF and LF line ends', async () => {
		const text = 'code,name,category\r\nM-1,Board,insulation\nM-2,Board,insulation\nM-3,Board,insulation\r\n';
		await expect(read(enc(text))).rejects.toThrow(
			/Line 2 ends with a line feed alone while the header line ends with CR LF: the file mixes two kinds of line end/
		);
	});

	it('says so when the first line is blank, and when text follows a closing quote', async () => {
		await expect(read(enc('\ncode,name\nA-1,Board\n'))).rejects.toThrow(
			/Line 1 is blank: the first line must be the header/
		);
		await expect(read(enc('code,name\nA-1,"5"" board"x\n'))).rejects.toThrow(
			/Line 2 opens a quoted field that is never closed properly: a closing quote is missing, or text follows it/
		);
	});

	it('stops reading when a row handler fails, and says why', async () => {
		let pulled = 0;
		async function* rows() {
			yield enc('code,name\n');
			for (let i = 0; i < 1000; i++) {
				pulled++;
				yield enc(`C-${i},Board\n`);
			}
		}
		await expect(
			readCsvStream(
				rows(),
				{},
				() => {},
				(_cells, line) => {
					if (line === 3) throw new Error('stop at line 3');
				}
			)
		).rejects.toThrow('stop at line 3');
		expect(pulled).toBeLessThan(1000);
	});
});
