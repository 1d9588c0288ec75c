import { test, expect, type Page, type BrowserContext } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// An automated accessibility check of every page (axe-core, the WCAG 2.1 A and AA rules it tests): no
// finding of serious or critical impact. axe finds part of what matters (labels, contrast, names,
// structure); keyboard use of the build-up table has its own tests. Each page is looked at as the role
// that works on it. Envelo's own bar (common practice, no source: serious and critical are the two
// highest of axe's four impacts).

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';

async function check(page: Page, path: string) {
	await page.goto(path);
	await waitForApp(page);
	// charts and live results render after hydration
	await page.waitForLoadState('networkidle');
	const result = await new AxeBuilder({ page })
		.withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'])
		.analyze();
	const bad = result.violations
		.filter((v) => v.impact === 'serious' || v.impact === 'critical')
		.map((v) => ({
			rule: v.id,
			impact: v.impact,
			help: v.help,
			where: v.nodes.slice(0, 3).map((n) => n.target.join(' '))
		}));
	expect(bad, `${path}: ${JSON.stringify(bad, null, 1)}`).toEqual([]);
}

async function ids() {
	const d = await db()('dwellings')
		.where({ organisation_id: NORTHFIELD })
		.whereExists(db()('elements').whereRaw('elements.dwelling_id = dwellings.id').whereNotNull('build_up'))
		.orderBy('reference')
		.first('id');
	const e = await db()('elements')
		.where({ dwelling_id: d.id })
		.whereNotNull('build_up')
		.orderBy('position')
		.first('id');
	const m = await db()('materials').where({ organisation_id: NORTHFIELD }).orderBy('code').first('id');
	const c = await db()('climates').where({ organisation_id: NORTHFIELD }).orderBy('name').first('id');
	const t = await db()('templates').where({ organisation_id: NORTHFIELD }).first('id');
	const lt = await db()('limit_tables').where({ organisation_id: NORTHFIELD }).first('id');
	return {
		dwelling: d.id,
		element: e.id,
		material: m.id,
		climate: c.id,
		template: t?.id,
		limitTable: lt?.id
	};
}

async function as(context: BrowserContext, email: string) {
	await signInAs(context, email);
	return context.newPage();
}

test('the public pages', async ({ page }) => {
	for (const path of ['/signin', '/verify']) await check(page, path);
});

test("the assessor's pages", async ({ context }) => {
	// Seventeen pages, each loaded and scanned in turn: more than the default minute on a busy two-core machine.
	test.setTimeout(180_000);
	const page = await as(context, DEMO.assessor);
	const i = await ids();
	const paths = [
		'/dwellings',
		'/dwellings/new',
		`/dwellings/${i.dwelling}`,
		`/dwellings/${i.dwelling}/elements/${i.element}`,
		`/dwellings/${i.dwelling}/elements/new`,
		`/dwellings/${i.dwelling}/reports`,
		`/dwellings/${i.dwelling}/evidence`,
		`/dwellings/${i.dwelling}/junctions`,
		`/dwellings/${i.dwelling}/junctions/new`,
		'/library',
		`/library/${i.material}`,
		'/library/new',
		'/library/import',
		'/climates',
		`/climates/${i.climate}`,
		'/templates',
		...(i.template ? [`/templates/${i.template}`] : [])
	];
	for (const path of paths) await check(page, path);
});

test("the supervisor's and the admin's pages", async ({ browser }) => {
	const sup = await as(await browser.newContext(), DEMO.supervisor);
	for (const path of ['/audit', '/audit/new', '/audit/returned']) await check(sup, path);
	const batch = await db()('audit_batches').where({ organisation_id: NORTHFIELD }).first('id');
	if (batch) {
		await check(sup, `/audit/${batch.id}`);
		const item = await db()('audit_items').where({ batch_id: batch.id }).first('id');
		if (item) await check(sup, `/audit/${batch.id}/items/${item.id}`);
	}
	const admin = await as(await browser.newContext(), DEMO.admin);
	const i = await ids();
	for (const path of [
		'/organisation',
		'/organisation/limit-tables',
		...(i.limitTable ? [`/organisation/limit-tables/${i.limitTable}`] : [])
	])
		await check(admin, path);
});
