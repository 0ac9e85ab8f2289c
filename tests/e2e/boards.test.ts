import { expect, test, type Browser, type Page } from '@playwright/test';
import { scan, signIn, smallPng, type PEOPLE } from './helpers';

async function openStation(browser: Browser, who: keyof typeof PEOPLE, code: string, blockStream: boolean): Promise<Page> {
	const context = await browser.newContext();
	if (blockStream) await context.route('**/api/stream', (route) => route.abort());
	const page = await context.newPage();
	await signIn(page, who);
	await page.goto(`/stations/${code}`);
	return page;
}

/** A station board with its live stream connected. */
async function openBoard(browser: Browser, who: keyof typeof PEOPLE, code: string): Promise<Page> {
	const page = await openStation(browser, who, code, false);
	await expect(page.getByTestId('live-status')).toHaveAttribute('data-status', 'open');
	return page;
}

async function firstQueued(page: Page, filter: { hasText?: string | RegExp; hasNotText?: string } = {}) {
	const row = page.getByTestId('queue').locator('tbody tr').filter(filter).first();
	return (await row.locator('td').first().innerText()).trim();
}

test('a scan on one board shows on another board without a reload', async ({ browser }) => {
	const wash = await openBoard(browser, 'tech', 'WASH');
	const lathe = await openBoard(browser, 'tech2', 'LATHE-A');
	const serial = await firstQueued(wash);
	await expect(lathe.getByTestId('queue').locator(`tr[data-serial="${serial}"]`)).toHaveCount(0);

	const started = Date.now();
	await scan(wash, serial);
	await expect(wash.getByTestId('scan-result')).toHaveText(`${serial} → Cleaned`);
	await expect(lathe.getByTestId('queue').locator(`tr[data-serial="${serial}"]`)).toHaveCount(1, { timeout: 5_000 });
	const seen = Date.now() - started;
	console.log(`board-to-board: ${seen} ms from the scan to the other board`);
	await expect(wash.getByTestId('queue').locator(`tr[data-serial="${serial}"]`)).toHaveCount(0);
	await expect(wash.getByTestId('done-today')).toContainText(serial);

	// a wall screen for the clean area follows too
	const tvPage = await wash.context().newPage();
	await tvPage.goto('/tv?stations=WASH,BLAST');
	await expect(tvPage.getByTestId('tv-WASH')).toBeVisible();
	await expect(tvPage.getByTestId('scan-input')).toHaveCount(0);
	await expect(tvPage.getByText('Caution at this station').first()).toBeVisible();
	const next = await firstQueued(wash);
	await expect(tvPage.getByTestId('tv-queue-WASH').locator(`tr[data-serial="${next}"]`)).toHaveCount(1);
	await scan(wash, next);
	await expect(wash.getByTestId('scan-result')).toHaveText(`${next} → Cleaned`);
	await expect(tvPage.getByTestId('tv-queue-WASH').locator(`tr[data-serial="${next}"]`)).toHaveCount(0);
	await wash.context().close();
	await lathe.context().close();
});

test('with the live stream blocked the board says so and polls', async ({ browser }) => {
	const watcher = await openStation(browser, 'office', 'PAINT', true);
	await expect(watcher.getByTestId('live-status')).toContainText('checking every 5 s');
	const tech = await openBoard(browser, 'tech', 'LATHE-B');
	const serial = await firstQueued(tech);
	await scan(tech, serial);
	await expect(tech.getByTestId('scan-result')).toHaveText(`${serial} → Machined`);
	await expect(watcher.getByTestId('queue').locator(`tr[data-serial="${serial}"]`)).toHaveCount(1, { timeout: 12_000 });
	await watcher.context().close();
	await tech.context().close();
});

test('teardown: qualify with a photo, scrap another with a reason, undo a scan, read it on the history pages', async ({ page }) => {
	await signIn(page, 'tech');
	// Rui's home station is Teardown 1
	await expect(page).toHaveURL(/\/stations\/TEARDOWN-1$/);
	await expect(page.getByTestId('live-status')).toHaveAttribute('data-status', 'open');

	// 1. a performance-family unit: the family has a checklist
	const p = await firstQueued(page, { hasText: 'CH-P' });
	await scan(page, p);
	await expect(page.getByTestId('scan-result')).toHaveText(`${p} → Inspected`);
	await expect(page.getByTestId('in-work').locator(`tr[data-serial="${p}"]`)).toHaveCount(1);
	const checklist = page.getByTestId('checklist');
	await expect(checklist).toBeVisible();
	// accepting with the checklist empty is refused, nothing saved
	await page.getByTestId('accept').click();
	await expect(page.getByTestId('refusal-message')).toContainText('Answer every item');
	const items = checklist.locator('[data-testid^="item-"]');
	const count = await items.count();
	expect(count).toBe(6);
	for (let i = 0; i < count; i++) {
		await items.nth(i).locator('label', { hasText: 'Pass' }).click();
		await expect(items.nth(i).getByRole('radio', { name: 'Pass' })).toBeChecked();
		const measure = items.nth(i).locator('input[name^="measure-"]');
		if (await measure.count()) await measure.fill(i === 2 ? '9.998' : '16.004');
	}
	await page.getByTestId('photos').setInputFiles([{ name: 'wheel-side.png', mimeType: 'image/png', buffer: smallPng() }]);
	await expect(page.getByTestId('photo-count')).toHaveText('1 photo chosen');
	await page.getByLabel('Note').fill('Clean core, light carbon on the turbine side');
	await page.getByTestId('accept').click();
	await expect(page.getByTestId('scan-result')).toHaveText(`${p} → Accepted`);

	// 2. another unit scrapped with a reason
	const f = await firstQueued(page, { hasText: 'Received', hasNotText: 'CH-P' });
	await scan(page, f);
	await expect(page.getByTestId('scan-result')).toHaveText(`${f} → Inspected`);
	await page.getByTestId('scrap').click();
	await expect(page.getByTestId('refusal-message')).toHaveText('Choose a scrap reason.');
	await page.getByTestId('scrap-reason').selectOption('BORE');
	await page.getByTestId('scrap').click();
	await expect(page.getByTestId('scan-result')).toHaveText(`${f} → Scrapped`);

	// 3. a scan undone
	const u = await firstQueued(page, { hasText: 'Received' });
	await scan(page, u);
	await expect(page.getByTestId('scan-result')).toHaveText(`${u} → Inspected`);
	await page.getByTestId('undo').click();
	await expect(page.getByTestId('scan-result')).toHaveText(`${u} → Received`);
	await expect(page.getByTestId('undone')).toBeVisible();
	await expect(page.getByTestId('scan-input')).toBeFocused();

	// 4. the history pages
	await page.goto(`/units/${p}`);
	const ins = page.getByTestId('inspection').first();
	await expect(ins).toContainText('Accepted');
	await expect(ins).toContainText('Clean core, light carbon');
	await expect(ins.getByTestId('answers').locator('tbody tr')).toHaveCount(6);
	await expect(ins.getByTestId('answers')).toContainText('16.004 mm');
	const img = ins.getByTestId('photos').locator('img').first();
	await expect(img).toBeVisible();
	expect(await img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth > 0)).toBe(true);
	await expect(page.getByTestId('stage-times')).toContainText('Accepted (now)');
	await expect(page.getByTestId('history')).toContainText('Accepted');

	await page.goto(`/units/${f}`);
	await expect(page.getByTestId('unit-state')).toContainText('Scrapped');
	await expect(page.getByTestId('inspection-reason')).toHaveText('reason BORE');
	await expect(page.getByTestId('history').locator('tbody tr').last()).toContainText('reason BORE');

	await page.goto(`/units/${u}`);
	const rows = page.getByTestId('history').locator('tbody tr');
	await expect(rows.last()).toContainText('Undone');
	await expect(rows.last()).toContainText('undoes #2');
	await expect(page.getByTestId('unit-state')).toContainText('Received');
});

test('the owner sets a station threshold, a scrap reason and a checklist item', async ({ page }) => {
	await signIn(page, 'owner');
	await page.goto('/admin/floor');
	await page.getByTestId('overdue-PAINT').fill('0.5');
	await page.getByTestId('save-overdue-PAINT').click();
	await expect(page.getByTestId('settings-saved')).toContainText('PAINT: overdue after 0.5 h');
	await page.goto('/admin/scrap-reasons');
	await page.getByLabel('Code').fill('seal-groove');
	await page.getByLabel('Description', { exact: true }).fill('Seal groove damaged');
	await page.getByLabel('Group').fill('bearing housing');
	await page.getByTestId('add-reason').click();
	await expect(page.getByTestId('reasons')).toContainText('SEAL-GROOVE');
	await page.getByLabel('Code').fill('x');
	await page.getByTestId('add-reason').click();
	await expect(page.getByTestId('reason-error')).toContainText('2 to 40 letters');
	await page.goto('/admin/checklists');
	await page.getByTestId('new-item-P').fill('Oil drain flange flatness');
	await page.getByTestId('new-unit-P').fill('mm');
	await page.getByTestId('add-item-P').click();
	await expect(page.getByTestId('checklist-P')).toContainText('Oil drain flange flatness (measure in mm)');
	await page.goto('/stations/PAINT');
	await expect(page.getByTestId('queue').getByText('overdue').first()).toBeVisible();
});
