// The typed rows of src/lib/server/tables.ts say what the migrated schema has: every table they name
// exists, each with exactly the columns listed, nullable exactly where the type allows null, and a
// number, text, boolean or date type where the row says so. (Envelo's own schema; no outside source.)
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { hasDatabase, tdb } from '../factories';

type Declared = { table: string; columns: Map<string, string> };

/** The interfaces of tables.ts, each with its table name (its doc comment) and its columns' types. */
function declaredRows(): Declared[] {
	const text = readFileSync(new URL('../../src/lib/server/tables.ts', import.meta.url), 'utf8');
	const rows: Declared[] = [];
	for (const m of text.matchAll(/\/\*\* `(\w+)` \*\/\s*export interface \w+ \{([^}]*)\}/g)) {
		const columns = new Map<string, string>();
		for (const c of m[2].matchAll(/^\t(\w+): ([^;]+);$/gm)) columns.set(c[1], c[2]);
		rows.push({ table: m[1], columns });
	}
	return rows;
}

const KINDS: Record<string, RegExp> = {
	number: /^(integer|bigint|double precision|numeric)$/,
	string: /^(text|uuid|character varying)$/,
	boolean: /^boolean$/,
	Date: /^(timestamp with time zone|date)$/,
	Buffer: /^bytea$/,
	'string[]': /^ARRAY$/
};

describe.skipIf(!hasDatabase)('the typed table rows', () => {
	const declared = declaredRows();

	it('cover the tables the services read', () => {
		expect(declared.map((d) => d.table)).toEqual(
			expect.arrayContaining(['dwellings', 'elements', 'material_revisions', 'junctions', 'reports'])
		);
	});

	it.each(declared.map((d) => [d.table, d] as const))(
		'%s: columns, nulls and types as migrated',
		async (_, d) => {
			const cols: { column_name: string; is_nullable: string; data_type: string }[] = await tdb()(
				'information_schema.columns'
			)
				.where({ table_schema: 'public', table_name: d.table })
				.select('column_name', 'is_nullable', 'data_type');
			expect(cols.length).toBeGreaterThan(0);
			expect([...d.columns.keys()].sort()).toEqual(cols.map((c) => c.column_name).sort());
			for (const c of cols) {
				const type = d.columns.get(c.column_name)!;
				const parts = type.split('|').map((p) => p.trim());
				expect(parts.includes('null'), `${d.table}.${c.column_name} nullable`).toBe(c.is_nullable === 'YES');
				const base = parts.filter((p) => p !== 'null');
				const plain = base.length === 1 ? KINDS[base[0]] : undefined;
				// a JSON column carries its schema's type; an enumerated text column its union of values
				if (c.data_type === 'jsonb') expect(plain, `${d.table}.${c.column_name}`).toBeUndefined();
				else if (plain) expect(c.data_type, `${d.table}.${c.column_name}`).toMatch(plain);
				else expect(c.data_type, `${d.table}.${c.column_name} (a union)`).toBe('text');
			}
		}
	);
});
