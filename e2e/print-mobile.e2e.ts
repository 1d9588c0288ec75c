import { test, expect, type Page } from '@playwright/test';
import { DEMO, db, signInAs, waitForApp } from './helpers';

// Printing and a phone-sized screen. Printed, the dwelling and element pages show their content without
// the navigation, buttons or the save bar; on a 390 px wide screen the dwelling list, a dwelling and an
// audit item fit the width (tables scroll inside their card). Envelo's own bar (common practice, no source).

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';

async function demo() {
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
	return { dwelling: d.id as string, element: e.id as string };
}

/** The page is no wider than the screen. */
async function fits(page: Page) {
	const { scroll, width, wide } = await page.evaluate(() => {
		const w = window.innerWidth;
		// the outermost elements that reach past the screen's edge, to say which
		const wide = [...document.querySelectorAll('body *')]
			.filter((el) => el.getBoundingClientRect().right > w + 1)
			.filter((el) => !el.parentElement || el.parentElement.getBoundingClientRect().right <= w + 1)
			.filter((el) => !el.closest('[class*=overflow-x-auto]') || el.matches('[class*=overflow-x-auto]'))
			.slice(0, 5)
			.map(
				(el) =>
					`${el.tagName.toLowerCase()}.${[...el.classList].join('.')}${el.getAttribute('data-testid') ? `[${el.getAttribute('data-testid')}]` : ''} in ${el.closest('section,figure,div[class*=card]')?.getAttribute('aria-label') ?? el.closest('section,figure,div[class*=card]')?.querySelector('h2,h3')?.textContent ?? '?'}`
			);
		return { scroll: document.documentElement.scrollWidth, width: w, wide };
	});
	expect(
		scroll,
		`${page.url()} is ${scroll} px wide on a ${width} px screen: ${wide.join(', ')}`
	).toBeLessThanOrEqual(width + 1);
}

test('the dwelling and element pages print without the navigation and buttons', async ({ page, context }) => {
	await signInAs(context, DEMO.assessor);
	const { dwelling, element } = await demo();
	for (const path of [`/dwellings/${dwelling}`, `/dwellings/${dwelling}/elements/${element}`]) {
		await page.goto(path);
		await waitForApp(page);
		await page.emulateMedia({ media: 'print' });
		await expect(page.locator('header').first()).toBeHidden();
		await expect(page.locator('.btn').first()).toBeHidden();
		await expect(page.locator('main h1')).toBeVisible();
		await page.emulateMedia({ media: null });
	}
	await page.goto(`/dwellings/${dwelling}/elements/${element}`);
	await waitForApp(page);
	await expect(page.getByTestId('build-up-section')).toBeVisible();
	await page.pdf({ path: '/tmp/element-page-print.pdf', format: 'A4' });
});

test('the dwelling list, a dwelling and an audit item fit a phone-sized screen', async ({ browser }) => {
	const ctx = await browser.newContext({ viewport: { width: 390, height: 844 } });
	await signInAs(ctx, DEMO.supervisor);
	const page = await ctx.newPage();
	const { dwelling } = await demo();
	const paths = ['/dwellings', `/dwellings/${dwelling}`, '/audit'];
	const item = await db()('audit_items as i')
		.join('audit_batches as b', 'b.id', 'i.batch_id')
		.where('b.organisation_id', NORTHFIELD)
		.first('i.id', 'i.batch_id');
	if (item) paths.push(`/audit/${item.batch_id}/items/${item.id}`);
	for (const path of paths) {
		await page.goto(path);
		await waitForApp(page);
		await fits(page);
	}
	await page.goto(`/dwellings/${dwelling}`);
	await waitForApp(page);
	await page.screenshot({ path: '/tmp/dwelling-phone.png', fullPage: true });
	await ctx.close();
});
