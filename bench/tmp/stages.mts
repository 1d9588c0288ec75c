import { register } from 'node:module';
register('data:text/javascript,' + encodeURIComponent(`
export async function resolve(spec, ctx, next) {
	if (spec === '$app/environment') return { url: 'data:text/javascript,export const building=false,dev=false,browser=false;', shortCircuit: true };
	if (spec === '$env/dynamic/private') return { url: 'data:text/javascript,export const env=process.env;', shortCircuit: true };
	return next(spec, ctx);
}`));
import Papa from 'papaparse';
const { readCsvStream } = await import('/work/main/src/lib/server/csv/read.ts');
const { materialValuesSchema } = await import('/work/main/src/lib/library/schema.ts');
function csv(n: number, prefix: string): string {
	const lines = ['code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes'];
	for (let i = 0; i < n; i++) { const lambda = (0.03 + (i % 20) / 1000).toFixed(3);
		lines.push(`${prefix}-${String(i).padStart(6, '0')},"Board ${i}, rigid",Bench Products,insulation,${lambda},declared,,${1 + (i % 60)},,,${20 + (i % 50)},1030,20,300,Declaration of performance B-${i},2025-01-01,2030-01-01,no,`); }
	return lines.join('\n') + '\n';
}
const text = csv(10000, 'X'); const bytes = new TextEncoder().encode(text);
for (let rep = 0; rep < 3; rep++) {
let t = performance.now(); let n = 0;
Papa.parse<string[]>(text, { step: () => void n++ }); const p0 = performance.now() - t;
t = performance.now(); n = 0;
await readCsvStream(bytes, {}, () => {}, () => void n++); const p1 = performance.now() - t;
const raw = { code: 'X-1', name: 'Board', manufacturer: 'B', category: 'insulation', lambda: 0.035, lambdaKind: 'declared', resistance: null, muDry: 5, muWet: null, sd: null, density: 30, specificHeat: 1030, thicknessMinMm: 20, thicknessMaxMm: 300, source: 'D', sourceIssued: '2025-01-01', sourceExpires: '2030-01-01', indicative: false, notes: null };
t = performance.now(); for (let i = 0; i < 10000; i++) materialValuesSchema.safeParse({ ...raw }); const z = performance.now() - t;
console.log(`papa ${p0.toFixed(0)} stream-read ${p1.toFixed(0)} zod×10k ${z.toFixed(0)}`);
}
