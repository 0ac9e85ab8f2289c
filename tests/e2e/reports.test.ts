import { expect, test } from '@playwright/test';
import Papa from 'papaparse';
import { readFile } from 'node:fs/promises';
import { signIn } from './helpers';

test('the owner filters the scrap report by supplier, opens a flagged lot and exports the CSV', async ({ page }) => {
	await signIn(page, 'owner');
	await page.getByRole('link', { name: 'Reports', exact: true }).click();
	await page.getByRole('link', { name: 'Scrap by core lot' }).click();
	await expect(page.getByTestId('lot-table')).toBeVisible();

	await page.getByLabel('Supplier', { exact: true }).selectOption({ label: 'Ninemile Salvage & Parts' });
	await page.getByRole('button', { name: 'Apply' }).click();
	await expect(page).toHaveURL(/supplier=\d+/);
	const rows = page.getByTestId('lot-row');
	await expect(rows.first()).toContainText('Ninemile Salvage & Parts');
	for (const text of await rows.allInnerTexts()) expect(text).toContain('Ninemile Salvage & Parts');

	const flaggedRow = rows.filter({ has: page.getByTestId('flagged') }).first();
	await expect(flaggedRow).toBeVisible();
	const code = (await flaggedRow.getAttribute('data-lot'))!;

	// The CSV holds the same rows, the flagged lot marked.
	const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Export CSV' }).first().click()]);
	expect(download.suggestedFilename()).toBe('scrap-by-lot.csv');
	const csv = Papa.parse<Record<string, string>>(await readFile((await download.path())!, 'utf8'), { header: true, skipEmptyLines: true });
	expect(csv.data.length).toBe(await rows.count());
	expect(csv.data.every((r) => r.Supplier === 'Ninemile Salvage & Parts')).toBe(true);
	const line = csv.data.find((r) => r.Lot === code)!;
	expect(line['Above UCL']).toBe('yes');
	expect(Number(line['Scrap rate'])).toBeGreaterThan(Number(line['p-chart UCL']));

	await flaggedRow.getByRole('link', { name: code }).click();
	await expect(page.getByTestId('lot-code')).toHaveText(`Lot ${code}`);
	await expect(page.getByTestId('lot-flag')).toContainText('Above the upper control limit');
	await expect(page.getByTestId('lot-reasons')).toBeVisible();

	// The lot table sorts on the server: worst scrap rate first, the order kept in the address.
	await page.goto('/reports/scrap');
	await page.getByTestId('lot-table').getByRole('link', { name: /^Scrap rate/ }).click();
	await expect(page).toHaveURL(/sort=rate&dir=asc/);
	await page.getByTestId('lot-table').getByRole('link', { name: /^Scrap rate/ }).click();
	await expect(page).toHaveURL(/sort=rate&dir=desc/);
	await expect(page.getByTestId('lot-table').locator('th[aria-sort="descending"]')).toContainText('Scrap rate');
	const rates = (await page.getByTestId('lot-row').locator('td:nth-child(9)').allInnerTexts()).map((t) => (t.trim() === '—' ? -1 : parseFloat(t)));
	expect(rates.length).toBeGreaterThan(1);
	expect(rates).toEqual([...rates].sort((a, b) => b - a));
	const bad = await page.request.get('/api/reports/scrap?per=7');
	expect(bad.status()).toBe(400);
	expect((await bad.json()).error.message).toContain('Rows per page');
});

test('a tech cannot open the scrap report or its data', async ({ page }) => {
	await signIn(page, 'tech');
	const res = await page.goto('/reports/scrap');
	expect(res?.status()).toBe(403);
	const api = await page.request.get('/api/reports/scrap');
	expect(api.status()).toBe(403);
	await expect(page.getByRole('link', { name: 'Reports', exact: true })).toHaveCount(0);
});

test('screens of the other reports render (for a look)', async ({ page }) => {
	await signIn(page, 'owner');
	for (const [path, shot] of [
		['/reports/scrap', 'scrap'],
		['/reports/suppliers', 'suppliers'],
		['/reports/flow', 'flow'],
		['/reports/warranty', 'warranty']
	] as const) {
		await page.goto(path);
		await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
		await expect(page.locator('table').first()).toBeVisible();
		if (process.env.SHOTS) await page.screenshot({ path: `test-results/${shot}.png`, fullPage: true });
	}
	// the returns by bearing-kit and seal-kit lot, with the rule that flags a lot
	await expect(page.getByTestId('parts-lots').getByRole('heading', { name: 'Returns by parts lot' })).toBeVisible();
	await expect(page.getByTestId('parts-lots').locator('tbody tr').first()).toContainText(/BK-|SK-/);
	await page.getByTestId('returns-table').getByRole('link').first().click();
	await expect(page.getByTestId('trace-original')).toBeVisible();
	await expect(page.getByTestId('trace-stations')).toBeVisible();
	// the original's build record: its kit lots and its balance runs
	await expect(page.getByTestId('assembly-records')).toContainText(/BK-\d+/);
	await expect(page.getByTestId('balance-runs').getByText(/Pass|Fail/).first()).toBeVisible();
	if (process.env.SHOTS) await page.screenshot({ path: 'test-results/trace.png', fullPage: true });
});

test('a supplier named like a formula reaches the owner’s CSV as text, with a byte-order mark so accents survive', async ({ page, browser }) => {
	const evil = '=HYPERLINK("http://evil.example","Søren")';
	// the office renames a supplier (office and owner edit suppliers)
	await signIn(page, 'office');
	await page.goto('/suppliers');
	const row = page.getByTestId('suppliers').locator('tr', { hasText: 'Ashgrove Core Exchange' });
	await row.getByRole('button', { name: 'Edit' }).click();
	await page.getByTestId('suppliers').getByLabel('Name').fill(evil);
	await page.getByTestId('suppliers').getByRole('button', { name: 'Save' }).click();
	await expect(page.getByTestId('suppliers')).toContainText(evil);

	const owner = await browser.newPage();
	await signIn(owner, 'owner');
	await owner.goto('/reports/suppliers');
	await expect(owner.getByTestId('supplier-table')).toContainText(evil);
	const [download] = await Promise.all([owner.waitForEvent('download'), owner.getByRole('button', { name: 'Export CSV' }).first().click()]);
	expect(download.suggestedFilename()).toBe('suppliers.csv');
	const bytes = await readFile((await download.path())!);
	// UTF-8 BOM (EF BB BF, Unicode Standard §23.8), CRLF rows (RFC 4180 §2)
	expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
	const text = bytes.toString('utf8');
	expect(text).toContain('\r\n');
	// read back with papaparse: the cell is the name with a leading quote, so no spreadsheet runs it
	const csv = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
	const names = csv.data.map((r) => r.Supplier);
	expect(names).toContain(`'${evil}`);
	expect(names.filter((n) => /^[=+\-@]/.test(n))).toEqual([]);
	await owner.close();
});
