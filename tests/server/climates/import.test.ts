import { describe, it, expect } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { parseClimateCsv } from '../../../src/lib/server/climates/import';

// A regression guard for the climate CSV reader. `import.characterisation.json` beside this file is
// the reader's own earlier output, recorded once from the code as it stood before it was split into
// small functions: it is no outside reference, only proof that the same inputs still give the same
// result (accepted values, the same messages word for word, the same lines, the same order of
// problems). The format itself is Envelo's own (common practice, no source); the figures in the
// fixtures and below are invented.
//
// Every CSV under fixtures/ is read as bytes and as text, and so are the inputs below, which reach
// the branches the fixtures do not.

const EXPECTED = JSON.parse(
	fs.readFileSync(path.resolve('tests/server/climates/import.characterisation.json'), 'utf8')
) as { comment: string; results: Record<string, unknown> };

const enc = (s: string) => new TextEncoder().encode(s);
const HEAD = 'month,temperature,relative_humidity';
const year = (row: (m: number) => string) => Array.from({ length: 12 }, (_, i) => row(i + 1)).join('\n');

const SYNTHETIC: [string, string | Uint8Array][] = [
	['valid, comma, trailing line end', `${HEAD}\n${year((m) => `${m},${m - 3},${70 + m}`)}\n`],
	['valid, rows out of order', `${HEAD}\n${year((m) => `${13 - m},${m / 2},${60 + m}`)}`],
	[
		'tab separated, decimal commas, unicode minus, units in the header, month abbreviations',
		`Month\tTemperature (°C)\tRH [%]\n${year((m) => `${['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'][m - 1]}\t\u2212${m},5\t8${m % 10},25`)}`
	],
	[
		'semicolon, header aliases, full month names in capitals',
		`MON;theta_e;phi_e\n${year((m) => `${['JANUARY', 'FEBRUARY', 'MARCH', 'APRIL', 'MAY', 'JUNE', 'JULY', 'AUGUST', 'SEPTEMBER', 'OCTOBER', 'NOVEMBER', 'DECEMBER'][m - 1]};${m},0;${50 + m}`)}`
	],
	['extra columns and extra cells', `note,${HEAD},other\n${year((m) => `x,${m},${m},${50 + m},y,z`)}`],
	['decimal comma in a comma-separated file', `${HEAD}\n${year((m) => `${m},"${m},5",80`)}`],
	[
		'number forms: sign, leading point, trailing point, exponent, spaces',
		`${HEAD}\n1,+3,80\n2,.5,80\n3,5.,80\n4,1e1,80\n5, 7 ,80\n6,-.5,81\n7,--1,80\n8,1.2.3,80\n9,0x10,80\n10,Infinity,80\n11,NaN,80\n12,1 000,80`
	],
	[
		'month forms: 1.0, 0, 2.5, 13, -1, a word, decimal comma month',
		`${HEAD}\n1.0,1,80\n0,1,80\n2.5,1,80\n13,1,80\n-1,1,80\nfoo,1,80\nJanuar,1,80\nSept,1,80\n 3 ,1,80\n4,1,80\n5,1,80\n6,1,80`
	],
	[
		'month forms with semicolons: 1,0 and 12,0',
		`month;temperature;relative_humidity\n1,0;1;80\n12,0;1;80\n${year((m) => `${m};1;80`)
			.split('\n')
			.slice(1, 11)
			.join('\n')}`
	],
	[
		'empty cells in every column',
		`${HEAD}\n,,\n1,,\n2,3,\n,3,80\n${year((m) => `${m},1,80`)
			.split('\n')
			.slice(2)
			.join('\n')}`
	],
	[
		'temperature and humidity limits',
		`${HEAD}\n1,-80,0\n2,80,100\n3,-80.1,1\n4,80.5,0.5\n5,-100,-0\n6,0,100.1\n7,1,1.0\n8,1,0.999\n9,1,-3\n10,1,250\n11,1,50\n12,1,50`
	],
	['long unreadable cells are shortened', `${HEAD}\n${'x'.repeat(40)},${'y'.repeat(30)},${'z'.repeat(24)}\n`],
	['every fault on one row, with a duplicate month', `${HEAD}\n1,1,80\n1,x,0.5\n1,1,80\n2,99,80`],
	[
		'duplicate month on a row with other faults',
		`${HEAD}\n${year((m) => `${m === 5 ? 4 : m},1,80`)}\n4,x,200`
	],
	['twelve rows with duplicates and a gap', `${HEAD}\n${year((m) => `${m === 12 ? 11 : m},1,80`)}`],
	['one month', `${HEAD}\n1,1,80`],
	['fourteen rows, months repeated', `${HEAD}\n${year((m) => `${m},1,80`)}\n1,1,80\n2,1,80`],
	[
		'ten rows, all faults',
		`${HEAD}\n${year((m) => `${m},x,80`)
			.split('\n')
			.slice(0, 10)
			.join('\n')}`
	],
	[
		'short rows: one value and two values',
		`${HEAD}\n1\n2,3\n${year((m) => `${m},1,80`)
			.split('\n')
			.slice(2)
			.join('\n')}`
	],
	[
		'blank lines between rows, CRLF line ends, quoted line break',
		`${HEAD}\r\n\r\n1,1,80\r\n\r\n"2\r\n",1,80\r\n3,"1",80\r\n${year((m) => `${m},1,80`)
			.split('\n')
			.slice(3)
			.join('\r\n')}\r\n\r\n`
	],
	['a line break in a quoted cell moves the lines after it', `${HEAD}\n"1",1,"80\n"\n2,1,x\n3,1,80`],
	['header only, with blank lines after it', `${HEAD}\n\n   \n`],
	['whitespace only', ' \n\t\n  '],
	['byte order mark only', '\uFEFF'],
	['byte order mark before a valid file', `\uFEFF${HEAD}\n${year((m) => `${m},1,80`)}`],
	['separators only', ',,\n,,\n'],
	['numeric first row', year((m) => `${m},1,80`)],
	['first row of month words and numbers', `January,5,80\n${year((m) => `${m},1,80`)}`],
	['header missing two columns', `month,wind,sun\n1,2,3`],
	['header with no known column', `a;b\n1;2`],
	['header with blank and spaced names', ` Month , temp ,  , RH \n1,2,,80`],
	['header alias spelt with dashes and points', `Month-Number,Temp.C,Relative Humidity %\n1,2,80`],
	['a text too long', `${HEAD}\n` + '1,1,80\n'.repeat(10_000)],
	['bytes too long', enc(`${HEAD}\n` + '1,1,80\n'.repeat(10_000))],
	['bytes at the limit', enc(`${HEAD}\n` + '1'.repeat(64 * 1024 - HEAD.length - 1))],
	['no bytes', new Uint8Array(0)],
	['a UTF-16 byte order mark', new Uint8Array([0xff, 0xfe, 0x6d, 0x00, 0x6f, 0x00])],
	['a workbook', new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00])],
	['a zero byte on line 2', new Uint8Array([0x6d, 0x6f, 0x6e, 0x74, 0x68, 0x0a, 0x00, 0x01])],
	['Latin-1 on line 3', new Uint8Array([...enc(`${HEAD}\n1,1,80\n`), 0xe9, ...enc(',1,80\n')])],
	['an unclosed quote', `${HEAD}\n1,1,80\n"2,1,80\n3,1,80`]
];

function fixtureFiles(): string[] {
	return (fs.readdirSync('fixtures', { recursive: true }) as string[])
		.filter((f) => f.endsWith('.csv'))
		.map((f) => f.split(path.sep).join('/'))
		.sort();
}

/** The result as JSON holds it (so -0 reads as 0, as it did when it was recorded). */
const asRecorded = (r: unknown) => JSON.parse(JSON.stringify(r));

function actual(): Record<string, unknown> {
	const results: Record<string, unknown> = {};
	for (const f of fixtureFiles()) {
		const bytes = new Uint8Array(fs.readFileSync(path.join('fixtures', f)));
		results[`fixtures/${f} (bytes)`] = asRecorded(parseClimateCsv(bytes));
		results[`fixtures/${f} (text)`] = asRecorded(parseClimateCsv(new TextDecoder().decode(bytes)));
	}
	for (const [name, input] of SYNTHETIC) results[name] = asRecorded(parseClimateCsv(input));
	return results;
}

describe('parseClimateCsv: the same results as recorded', () => {
	const got = actual();
	it('reads the same set of inputs as were recorded', () => {
		expect(Object.keys(got).sort()).toEqual(Object.keys(EXPECTED.results).sort());
	});
	for (const name of Object.keys(got)) {
		it(name, () => {
			expect(got[name]).toEqual(EXPECTED.results[name]);
		});
	}
});
