import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

const MANIFEST = ['Core tag,Model,Notes', 'AX-500101,CH-F46,Oil in the intake', 'AX-500102,CH-V55,', 'AX-500103,CH-X00,Model not ours', 'AX-500104,CH-P61,', 'AX-500105,CH-F52,Cracked flange?', ''].join('\r\n');

test('the office creates a lot, imports a manifest with one bad row and prints its travelers', async ({ page }) => {
	await signIn(page, 'office');
	await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Lots' }).click();
	await expect(page.getByTestId('lot-table')).toBeVisible();
	await page.getByTestId('new-lot').click();

	// a skid without a supplier gets a field error and nothing is saved
	await page.getByLabel('Cores expected').fill('5');
	await page.getByTestId('create-lot').click();
	await expect(page.getByText('A purchased skid needs its supplier.')).toBeVisible();

	await page.getByLabel(/^Supplier/).selectOption({ label: 'Pellworth Fleet Services' });
	await page.getByLabel('Cost per core').fill('42.50');
	await page.getByLabel('Notes').fill('Fleet pulls, second skid this month.');
	await page.getByTestId('create-lot').click();
	await expect(page).toHaveURL(/\/lots\/L\d{6}-\d+\?created=1$/);
	const code = (await page.getByTestId('lot-code').innerText()).trim();

	await page.getByTestId('import-link').click();
	await page.getByLabel(/^Manifest/).setInputFiles({ name: 'skid.csv', mimeType: 'text/csv', buffer: Buffer.from(MANIFEST, 'utf8') });
	await page.getByTestId('read-file').click();
	await expect(page.getByTestId('check-summary')).toContainText('4 rows ready');
	const bad = page.getByTestId('bad-rows').locator('tbody tr');
	await expect(bad).toHaveCount(1);
	await expect(bad.first()).toContainText('4');
	await expect(bad.first()).toContainText('Unknown model "CH-X00".');
	await expect(page.getByTestId('map-model')).toHaveValue('1');

	await page.getByTestId('confirm-import').click();
	await expect(page.getByTestId('import-done')).toContainText('4 units imported');
	await expect(page.getByTestId('skipped-rows').locator('tbody tr')).toHaveCount(1);

	await page.goto(`/lots/${code}`);
	await expect(page.getByTestId('lot-units').locator('tbody tr')).toHaveCount(4);
	// one more by hand: a tag already in the lot is refused, a new one is received
	const add = page.getByTestId('add-unit');
	await add.getByLabel('Model').selectOption('CH-F58');
	await add.getByLabel('Original tag').fill('ax-500102');
	await add.getByRole('button', { name: 'Receive unit' }).click();
	await expect(add.getByText(/Tag ax-500102 is already in this lot \(SY-\d{5}\)\./)).toBeVisible();
	await add.getByLabel('Original tag').fill('AX-500199');
	await add.getByRole('button', { name: 'Receive unit' }).click();
	await expect(page.getByTestId('add-unit-done')).toContainText(`received into ${code}`);
	await expect(page.getByTestId('lot-units').locator('tbody tr')).toHaveCount(5);
	await expect(add.getByLabel('Model')).toHaveValue('CH-F58');
	await page.getByTestId('lot-units').locator('tbody tr').filter({ hasText: 'AX-500199' }).getByRole('link', { name: 'Traveler' }).click();
	await expect(page.getByTestId('traveler')).toHaveCount(1);
	await page.goBack();
	await page.getByTestId('travelers-label').click();
	await expect(page).toHaveURL(new RegExp(`/lots/${code}/travelers\\?layout=label`));
	await expect(page.getByTestId('traveler')).toHaveCount(5);
	for (const kind of ['barcode-code128', 'barcode-datamatrix']) {
		const imgs = page.getByTestId(kind);
		await expect(imgs).toHaveCount(5);
		for (let i = 0; i < 5; i++) {
			await expect.poll(() => imgs.nth(i).evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth > 0)).toBe(true);
		}
	}
	// the sheet layout puts the same five on one page
	await page.goto(`/lots/${code}/travelers?layout=sheet`);
	await expect(page.locator('.sheet')).toHaveCount(1);
	await expect(page.getByTestId('barcode-code128')).toHaveCount(5);

	// and the lot list shows it, with its counts in the CSV report
	const csv = await page.request.get('/lots.csv');
	expect(csv.headers()['content-type']).toBe('text/csv; charset=utf-8');
	expect(csv.headers()['content-disposition']).toMatch(/^attachment; filename="spoolyard-lots-\d{4}-\d{2}-\d{2}\.csv"$/);
	const text = await csv.text();
	expect(text.startsWith('\uFEFF')).toBe(true);
	// the office sees the price it typed in, not the per-lot shipped and scrapped counts (the owner's)
	expect(text.split('\r\n')[0]).toBe('\uFEFFlot,received_on,source,supplier,cost_per_core,expected,received,waiting_teardown,in_work,on_hold,notes');
	const line = text.split('\r\n').find((l) => l.startsWith(`${code},`));
	expect(line).toContain(',Purchased skid,Pellworth Fleet Services,42.50,5,5,5,0,0,');
	// the owner's CSV has every column: expected 5, received 5, waiting 5, in work 0, shipped 0, scrapped 0, on hold 0
	const ownerPage = await page.context().browser()!.newPage();
	await signIn(ownerPage, 'owner');
	const ownerLine = (await (await ownerPage.request.get('/lots.csv')).text()).split('\r\n').find((l) => l.startsWith(`${code},`));
	expect(ownerLine).toContain(',Purchased skid,Pellworth Fleet Services,42.50,5,5,5,0,0,0,0,');
	await ownerPage.close();
});

test('files we cannot read get a clear message', async ({ page }) => {
	await signIn(page, 'lead');
	await page.goto('/lots');
	await page.getByTestId('lot-table').locator('tbody tr').first().locator('a').first().click();
	await page.getByTestId('import-link').click();
	const upload = async (buffer: Buffer) => {
		await page.getByLabel(/^Manifest/).setInputFiles({ name: 'm.csv', mimeType: 'text/csv', buffer });
		await page.getByTestId('read-file').click();
	};
	await upload(Buffer.alloc(0));
	await expect(page.getByTestId('import-error')).toContainText('The file is empty');
	await upload(Buffer.from('Tag,Model,Notes\r\n'));
	await expect(page.getByTestId('import-error')).toContainText('header row but no data rows');
	await upload(Buffer.from('Tag,Model,Notes\r\nAX-1,CH-F46,Caf\u00e9\r\n', 'latin1'));
	await expect(page.getByTestId('import-error')).toContainText('not UTF-8');
	await upload(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('Tag,Model\r\nAX-1,CH-F46\r\n', 'utf16le')]));
	await expect(page.getByTestId('import-error')).toContainText('UTF-16');
});

test('a unit links to its traveler and its printable history', async ({ page }) => {
	await signIn(page, 'tech');
	await page.goto('/units');
	const serial = (await page.getByTestId('unit-table').locator('tbody tr').first().locator('td').first().innerText()).trim();
	await page.goto(`/units/${serial}`);
	await page.getByTestId('unit-print').click();
	await expect(page.getByTestId('record-serial')).toHaveText(serial);
	await expect(page.getByTestId('record-lot')).toHaveText(/^L\d{6}-\d+$/);
	await expect(page.getByTestId('record-history').locator('tbody tr').first()).toContainText('Received');
	await page.goto(`/units/${serial}/traveler`);
	await expect(page.getByTestId('traveler')).toHaveAttribute('data-serial', serial);
	await expect.poll(() => page.getByTestId('barcode-code128').evaluate((el: HTMLImageElement) => el.naturalWidth)).toBeGreaterThan(0);
});

test('a tech cannot create a lot', async ({ page }) => {
	await signIn(page, 'tech');
	const res = await page.goto('/lots/new');
	expect(res?.status()).toBe(403);
	await page.goto('/lots');
	await expect(page.getByTestId('new-lot')).toHaveCount(0);
	const post = await page.request.post('/lots/new', {
		form: { source: 'purchased_skid', supplierId: '1', receivedOn: '2026-12-01', costPerCore: '1', expectedCount: '1', notes: '' },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(post.status()).toBe(403);
});

test('changing a column choice runs the check again', async ({ page }) => {
	await signIn(page, 'owner');
	await page.goto('/lots');
	await page.getByTestId('lot-table').locator('tbody tr').nth(1).locator('a').first().click();
	await page.getByTestId('import-link').click();
	await page.getByLabel(/^Manifest/).setInputFiles({ name: 'remap.csv', mimeType: 'text/csv', buffer: Buffer.from('Qty,Part,Yard tag\n1,CH-F46,NM-1\n1,CH-F52,NM-2\n', 'utf8') });
	await page.getByTestId('read-file').click();
	// "Part" and "Yard tag" are guessed; the model is right, so both rows are ready
	await expect(page.getByTestId('check-summary')).toContainText('2 rows ready');
	await expect(page.getByTestId('map-originalTag')).toHaveValue('2');
	// one column for two fields is refused before any row is checked
	await page.getByTestId('map-model').selectOption({ label: 'Yard tag' });
	await expect(page.getByTestId('map-form')).toContainText('Column "Yard tag" is already used');
	await expect(page.getByTestId('check-summary')).toHaveCount(0);
	// the model from the wrong column: every row is an unknown model, and nothing can be imported
	await page.getByTestId('map-originalTag').selectOption('');
	await expect(page.getByTestId('bad-rows').locator('tbody tr')).toHaveCount(2);
	await expect(page.getByTestId('bad-rows')).toContainText('Unknown model "NM-1".');
	await expect(page.getByTestId('bad-rows')).toContainText('Unknown model "NM-2".');
	await expect(page.getByTestId('confirm-import')).toHaveCount(0);
	await page.getByTestId('map-model').selectOption({ label: 'Part' });
	await expect(page.getByTestId('check-summary')).toContainText('2 rows ready');
});

test('the office keeps the supplier list; a lead reads it', async ({ page }) => {
	await signIn(page, 'office');
	await page.goto('/suppliers');
	await page.getByLabel('Name').fill('Foxbarrow Core Yard');
	await page.getByLabel('Notes').fill('Small lots, cash on pickup.');
	await page.getByRole('button', { name: 'Add' }).click();
	const row = page.getByTestId('suppliers').locator('tbody tr').filter({ hasText: 'Foxbarrow Core Yard' });
	await expect(row).toContainText('Small lots, cash on pickup.');
	await row.getByRole('button', { name: 'Edit' }).click();
	const editor = page.getByTestId('suppliers').locator('form');
	await editor.getByLabel('Notes').fill('Small lots, mixed quality.');
	await editor.getByRole('button', { name: 'Save' }).click();
	await expect(page.getByText('Foxbarrow Core Yard saved.')).toBeVisible();
	await expect(page.getByTestId('suppliers').locator('tbody tr').filter({ hasText: 'Foxbarrow Core Yard' })).toContainText('Small lots, mixed quality.');
	// a duplicate name is refused with a field error
	await page.getByLabel('Name').fill('foxbarrow core yard');
	await page.getByRole('button', { name: 'Add' }).click();
	await expect(page.getByText('foxbarrow core yard is already on the list.')).toBeVisible();

	await page.context().clearCookies();
	await signIn(page, 'lead');
	await page.goto('/suppliers');
	await expect(page.getByTestId('suppliers')).toContainText('Foxbarrow Core Yard');
	await expect(page.getByRole('button', { name: 'Edit' })).toHaveCount(0);
	const post = await page.request.post('/suppliers?/create', { form: { name: 'Sneaky', notes: '' }, headers: { origin: new URL(page.url()).origin } });
	expect(post.status()).toBe(403);
});
