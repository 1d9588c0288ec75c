import { register } from 'node:module';
register('data:text/javascript,' + encodeURIComponent(`
export async function resolve(spec, ctx, next) {
	if (spec === '$app/environment') return { url: 'data:text/javascript,export const building=false,dev=false,browser=false;', shortCircuit: true };
	if (spec === '$env/dynamic/private') return { url: 'data:text/javascript,export const env=process.env;', shortCircuit: true };
	return next(spec, ctx);
}`));
const { previewMaterialsImport } = await import('../../src/lib/server/csv/materials');
const { db, authPool } = await import('../../src/lib/server/db');
function csv(n: number, prefix: string): string {
	const lines = ['code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes'];
	for (let i = 0; i < n; i++) { const lambda = (0.03 + (i % 20) / 1000).toFixed(3);
		lines.push(`${prefix}-${String(i).padStart(6, '0')},"Board ${i}, rigid",Bench Products,insulation,${lambda},declared,,${1 + (i % 60)},,,${20 + (i % 50)},1030,20,300,Declaration of performance B-${i},2025-01-01,2030-01-01,no,`); }
	return lines.join('\n') + '\n';
}
const org = (await db('organisations').first('id')).id;
const bytes = new TextEncoder().encode(csv(10000, 'P'));
for (let i = 0; i < 6; i++) { const t = performance.now(); await previewMaterialsImport(db, org, bytes); console.log(`preview ${(performance.now() - t).toFixed(0)} ms`); }
await db.destroy(); await authPool.end();
