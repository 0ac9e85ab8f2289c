import { expect, test, type Browser, type Page } from '@playwright/test';
import { simpleParser } from 'mailparser';
import { scan, signIn, smallPng } from './helpers';
import { recordAssembly, recordPassingRun } from './bench';

/** Read the newest message to `to` whose subject contains `subject`, through the local SMTP fake's mailbox. */
async function waitForMail(owner: Page, to: string, subject: string) {
	let raw = '';
	await expect
		.poll(
			async () => {
				await owner.goto('/dev/mail');
				const row = owner.getByTestId('dev-mail').locator('tbody tr').filter({ hasText: to }).filter({ hasText: subject }).first();
				if ((await row.count()) === 0) return false;
				const href = await row.getByRole('link', { name: 'Raw' }).getAttribute('href');
				raw = await (await owner.request.get(href!)).text();
				return true;
			},
			{ timeout: 20_000, intervals: [300, 500, 1000] }
		)
		.toBe(true);
	return simpleParser(raw);
}

async function signedIn(browser: Browser, who: Parameters<typeof signIn>[1]) {
	const ctx = await browser.newContext();
	const page = await ctx.newPage();
	await signIn(page, who);
	return page;
}

async function scanAt(tech: Page, code: string, serial: string, expected: string) {
	await tech.goto(`/stations/${code}`);
	await scan(tech, serial);
	await expect(tech.getByTestId('scan-result')).toHaveText(`${serial} → ${expected}`);
}

test('a customer follows their unit from intake to shipment: link, quote, payment, tracking', async ({ browser }) => {
	test.setTimeout(120_000);
	const email = `e2e-${Date.now()}@customer.example`;
	const office = await signedIn(browser, 'office');
	const owner = await signedIn(browser, 'owner');
	const tech = await signedIn(browser, 'tech');

	// The office takes in the unit and opens the order in one step.
	await office.goto('/orders');
	await office.getByLabel('Customer name').fill('Wren Ashcombe');
	await office.getByLabel('E-mail', { exact: true }).fill(email);
	await office.getByLabel('Phone').fill('555-0199');
	await office.getByLabel('Shipping address').fill('9 Lantern Court\nPellmarsh');
	await office.getByLabel('Model').selectOption('CH-V55');
	await office.getByLabel('Tag as received').fill('WA-551020');
	await office.getByLabel('Complaint').fill('Loses boost when hot.');
	await office.getByRole('button', { name: 'Receive unit and open order' }).click();
	await expect(office.getByTestId('order-created')).toBeVisible();
	const serial = (await office.getByTestId('order-serial').innerText()).trim();
	expect(serial).toMatch(/^SY-\d{5}$/);
	const orderUrl = office.url().split('?')[0];
	const orderCode = (await office.getByTestId('order-code').innerText()).trim();

	// The status e-mail arrives in the SMTP fake, with a link.
	const mail = await waitForMail(owner, email, 'we received your unit');
	const links = [...(mail.text ?? '').matchAll(/https?:\/\/\S+\/track\/[A-Za-z0-9_-]{43}/g)].map((m) => m[0]);
	// one status link, on this server, in the text and as the HTML part's link
	expect(links).toHaveLength(1);
	const link = links[0];
	expect(new URL(link).origin).toBe(new URL(office.url()).origin);
	expect(mail.html).toContain(`<a href="${link}">Open your status page</a>`);
	expect(String(mail.html)).not.toMatch(/<img/i);

	// A fresh browser with no sign-in opens it and sees the stage.
	const customerCtx = await browser.newContext();
	const customer = await customerCtx.newPage();
	await customer.goto(link!);
	await expect(customer.getByTestId('track-stage')).toContainText('We have your unit');
	await expect(customer.getByTestId('track-photos')).toContainText('No photos');
	await expect(customer.getByText(serial)).toBeVisible();

	// Teardown qualifies it; the floor cannot start work before the quote is approved.
	await scanAt(tech, 'TEARDOWN-1', serial, 'Inspected');
	await tech.getByTestId('photos').setInputFiles([{ name: 'IMG_4471.png', mimeType: 'image/png', buffer: smallPng(48, 32, [140, 60, 40]) }]);
	await tech.getByTestId('accept').click();
	await expect(tech.getByTestId('scan-result')).toHaveText(`${serial} → Accepted`);
	await tech.goto('/stations/WASH');
	await scan(tech, serial);
	await expect(tech.getByTestId('refusal-message')).toContainText('quote must be approved');

	// The office builds and sends the quote.
	await office.goto(orderUrl);
	const addLine = office.getByTestId('add-line');
	await addLine.getByLabel('Kind').selectOption('part');
	await addLine.getByLabel('Description').fill('Bearing and seal kit');
	await addLine.getByLabel('Qty / hours').fill('1');
	await addLine.getByLabel('Unit price').fill('89.50');
	await addLine.getByRole('button', { name: 'Add line' }).click();
	await expect(office.getByTestId('quote-lines')).toContainText('Bearing and seal kit');
	await addLine.getByLabel('Kind').selectOption('labour');
	await addLine.getByLabel('Description').fill('Rebuild and balance');
	await addLine.getByLabel('Qty / hours').fill('2.5');
	await addLine.getByLabel('Unit price').fill('95.00');
	await addLine.getByRole('button', { name: 'Add line' }).click();
	// 89.50 + 2.5 × 95.00 = 327.00; tax 8.25 % of 327.00 = 26.9775 → 26.98; total 353.98
	await expect(office.getByTestId('quote-total')).toHaveText('$353.98');
	await office.getByRole('button', { name: 'Send quote to the customer' }).click();
	await expect(office.getByTestId('quote-status')).toContainText('waiting for the customer');

	// The office shares the teardown photo with a caption; the customer sees it, not its file name.
	const photo = office.getByTestId('order-photo');
	await expect(photo).toHaveCount(1);
	await expect(photo.getByTestId('order-photo-state')).toContainText('Not shared');
	await photo.getByLabel('Caption the customer reads').fill('Oil coking found on the bearing housing');
	await photo.getByRole('button', { name: 'Share with the customer' }).click();
	await expect(office.getByTestId('order-message')).toContainText('sees this photo');
	await expect(office.getByTestId('order-photo').getByTestId('order-photo-state')).toContainText('Shared with the customer');

	// The customer sees the quote, approves and pays through the test checkout.
	await customer.reload();
	const shared = customer.getByTestId('track-photo');
	await expect(shared).toHaveCount(1);
	await expect(shared).toContainText('Oil coking found on the bearing housing');
	await expect(customer.getByTestId('track-photos')).not.toContainText('IMG_4471');
	await expect.poll(() => shared.locator('img').evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBeGreaterThan(0);
	await expect(customer.getByTestId('track-quote-total')).toHaveText('$353.98');
	await customer.getByRole('button', { name: 'Approve the quote' }).click();
	await expect(customer.getByTestId('track-message')).toContainText('approved');
	await customer.getByRole('button', { name: /^Pay / }).click();
	await expect(customer).toHaveURL(/^http:\/\/127\.0\.0\.1:\d+\/pay\/cs_test_/);
	await expect(customer.getByTestId('checkout-amount')).toHaveText('353.98 USD');
	await customer.getByRole('button', { name: 'Pay' }).click();
	await expect(customer).toHaveURL(/\/track\/[A-Za-z0-9_-]{43}\?paid=1$/);
	await expect(customer.getByTestId('track-paid-return')).toContainText('Payment received');
	await office.goto(orderUrl);
	await expect(office.getByTestId('quote-status')).toContainText('Approved and paid');

	// The floor moves it on, to packed.
	for (const [code, state] of [
		['WASH', 'Cleaned'],
		['LATHE-A', 'Machined'],
		['PAINT', 'Painted'],
		['BUILD-1', 'Assembled'],
		['BALANCE', 'Balanced'],
		['PACK', 'Packed']
	] as const) {
		// The build records that assembly and balancing need come first, from their own screens.
		if (code === 'BUILD-1') await recordAssembly(tech, serial);
		if (code === 'BALANCE') await recordPassingRun(tech, serial);
		await scanAt(tech, code, serial, state);
	}
	await waitForMail(owner, email, 'work has started');

	// The lead ships it to the customer; the tracking e-mail goes out.
	const lead = await signedIn(browser, 'lead');
	await lead.goto('/shipments');
	const form = lead.getByTestId('new-shipment');
	await form.getByLabel('A customer').check();
	await form.getByLabel('Customer order').selectOption({ label: `${orderCode} · Wren Ashcombe` });
	await form.getByLabel(`Ship ${serial}`).check();
	await form.getByLabel('Carrier').fill('Fenwick Parcel');
	await form.getByLabel('Tracking number').fill('FP-2026-004417');
	await form.getByRole('button', { name: 'Ship the chosen units' }).click();
	await expect(lead.getByTestId('shipment-tracking')).toHaveText('FP-2026-004417');
	const slip = await lead.request.get(`${new URL(lead.url()).pathname}/slip`);
	expect(slip.headers()['content-type']).toBe('application/pdf');
	expect((await slip.body()).subarray(0, 5).toString()).toBe('%PDF-');

	const shipped = await waitForMail(owner, email, 'has shipped');
	expect(shipped.text).toContain('FP-2026-004417');
	await customer.goto(link!);
	await expect(customer.getByTestId('track-tracking')).toHaveText('FP-2026-004417');
	await expect(customer.getByTestId('track-stage')).toContainText('On its way');
	await customerCtx.close();
});

test('a wrong status link gets the plain "not valid" page', async ({ browser }) => {
	const ctx = await browser.newContext();
	const page = await ctx.newPage();
	const res = await page.goto(`/track/${'A'.repeat(43)}`);
	expect(res?.status()).toBe(404);
	await expect(page.getByTestId('track-error')).toContainText('This link is not valid');
	await ctx.close();
});

