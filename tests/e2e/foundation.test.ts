import { expect, test } from '@playwright/test';
import { scan, signIn } from './helpers';
import { recordAssembly, recordPassingRun } from './bench';

test('a tech walks a demo core through every station to shipped and reads its history', async ({ page }) => {
	await signIn(page, 'tech');
	await page.goto('/stations/TEARDOWN-1');
	// wait for hydration so the enhanced form is in charge (the root layout marks <html> once mounted)
	await expect(page.locator('html')).toHaveAttribute('data-hydrated', 'true');
	const first = page.getByTestId('queue').locator('tbody tr').filter({ hasText: 'Received' }).filter({ hasNotText: 'CH-P' }).first().locator('td').first();
	const serial = (await first.innerText()).trim();
	expect(serial).toMatch(/^SY-\d{5}$/);

	await scan(page, serial);
	await expect(page.getByTestId('scan-result')).toHaveText(`${serial} → Inspected`);
	await page.getByTestId('accept').click();
	await expect(page.getByTestId('scan-result')).toHaveText(`${serial} → Accepted`);

	const route: [string, string][] = [
		['WASH', 'Cleaned'],
		['LATHE-A', 'Machined'],
		['PAINT', 'Painted'],
		['BUILD-1', 'Assembled'],
		['BALANCE', 'Balanced'],
		['PACK', 'Packed'],
		['SHIP', 'Shipped']
	];
	for (const [code, state] of route) {
		// Assembly and balance each need their record first: entered on the unit's bench pages.
		if (code === 'BUILD-1') await recordAssembly(page, serial);
		if (code === 'BALANCE') await recordPassingRun(page, serial);
		await page.goto(`/stations/${code}`);
		await scan(page, serial);
		await expect(page.getByTestId('scan-result')).toHaveText(`${serial} → ${state}`);
	}

	await page.goto(`/units/${serial}`);
	await expect(page.getByTestId('unit-state')).toContainText('Shipped');
	const rows = page.getByTestId('history').locator('tbody tr');
	await expect(rows).toHaveCount(10);
	await expect(rows.last()).toContainText('Ship');
	await expect(rows.nth(1)).toContainText('Teardown 1');
	await expect(rows.nth(1)).toContainText('Rui Almeida');
});

test('a move out of order shows the refusal sentence', async ({ page }) => {
	await signIn(page, 'tech2');
	await page.goto('/stations/TEARDOWN-1');
	const serial = (await page.getByTestId('queue').locator('tbody tr').filter({ hasText: 'Received' }).first().locator('td').first().innerText()).trim();
	await page.goto('/stations/PAINT');
	await scan(page, serial);
	await expect(page.getByTestId('refusal-message')).toHaveText(
		`${serial} is received; paint needs it inspected, accepted, cleaned and machined first.`
	);
});

test('a tech is refused an owner page', async ({ page }) => {
	await signIn(page, 'tech');
	const res = await page.goto('/admin/users');
	expect(res?.status()).toBe(403);
	await expect(page.getByTestId('error-message')).toContainText('may not open this page');
});

test('an office user cannot scan at a station', async ({ page }) => {
	await signIn(page, 'office');
	await page.goto('/stations/WASH');
	await expect(page.getByTestId('scan-disabled')).toBeVisible();
	await expect(page.getByTestId('scan-input')).toHaveCount(0);
	const res = await page.request.post('/api/units/SY-00001/events', {
		data: { action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: 'office-try-1' }
	});
	expect(res.status()).toBe(403);
	const form = await page.request.post('/stations/TEARDOWN-1?/scan', {
		form: { serial: 'SY-00001', idempotencyKey: 'office-try-2' },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(form.status()).toBe(403);
});

test('signed out, pages send you to sign in and the API answers 401', async ({ page }) => {
	await page.goto('/units');
	await expect(page).toHaveURL(/\/login\?next=%2Funits/);
	const res = await page.request.get('/api/units');
	expect(res.status()).toBe(401);
});

test('a wrong password gets a clear message', async ({ page }) => {
	await page.goto('/login');
	await page.getByLabel('E-mail').fill('rui@corvidhill.example');
	await page.getByLabel('Password').fill('not the password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByTestId('signin-error')).toContainText('do not match');
});
