import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

test('the owner compares two suppliers and reads the sentence', async ({ page }) => {
	await signIn(page, 'owner');
	await page.goto('/reports/suppliers');
	const compare = page.locator('section', { has: page.getByRole('heading', { name: 'Compare two' }) });
	await compare.getByLabel('Compare').selectOption('supplier');
	await compare.getByLabel('First').selectOption({ label: 'Ninemile Salvage & Parts' });
	await compare.getByLabel('Second').selectOption({ label: 'Pellworth Fleet Services' });
	await compare.getByRole('button', { name: 'Compare' }).click();
	await expect(page.getByTestId('compare-sentence')).toContainText(/Ninemile Salvage & Parts scraps more than Pellworth Fleet Services: \d+ to \d+ points more \(95 % interval\)\./);
	await expect(page.getByTestId('compare-table').locator('tbody tr')).toHaveCount(3);
	// the cost ranking, cheapest worst case first, has every supplier
	await expect(page.getByTestId('cost-table').locator('tbody tr')).toHaveCount(3);
});

test('the owner prices two skids side by side', async ({ page }) => {
	await signIn(page, 'owner');
	await page.goto('/reports/suppliers');
	const calc = page.getByTestId('skid-calculator');
	await calc.locator('#s-sup-0').selectOption({ label: 'Pellworth Fleet Services' });
	await calc.locator('#s-cores-0').fill('40');
	await calc.locator('#s-price-0').fill('60');
	await calc.locator('#s-sup-1').selectOption({ label: 'Ninemile Salvage & Parts' });
	await calc.locator('#s-cores-1').fill('60');
	await calc.locator('#s-price-1').fill('25.00');
	await calc.getByRole('button', { name: 'Price the offers' }).click();
	await expect(page.getByTestId('skid-table').locator('tbody tr')).toHaveCount(2);
	await expect(page.getByTestId('skid-good-A')).toContainText(/^\d+\.\d/);
	await expect(page.getByTestId('skid-cost-B')).toContainText(/\d+\.\d\d/);
	await expect(page.getByTestId('skid-sentence')).toContainText(/Offer [AB] \(.+\) (is|looks) cheaper per good core/);
	// a bad price is refused with a sentence and the other offer stays
	await calc.locator('#s-price-1').fill('twelve');
	await calc.getByRole('button', { name: 'Price the offers' }).click();
	await expect(calc.getByRole('alert')).toContainText('The price per core is dollars and cents, e.g. 32.50.');
	await expect(page.getByTestId('skid-good-A')).toBeVisible();
});

test('the lead sees the ramping model planned with the trend method, and the balancer on the home page', async ({ page }) => {
	await signIn(page, 'lead');
	await expect(page.getByTestId('drift-summary')).toContainText(/Drifting|Steady/);
	await page.goto('/plan');
	const row = page.getByTestId('plan').locator('tbody tr[data-model="CH-K60"]');
	await expect(row.getByTestId('method')).toContainText(/^Trend \(α [\d.]+, γ [\d.]+\)$/);
	await expect(row.getByTestId('trust')).toContainText(/^±\d+(\.\d)?$/);
	await expect(page.getByTestId('plan-why').locator('li[data-model="CH-K60"]')).toContainText('Trend smoothing follows this model better');
	await page.goto('/reports/balance');
	await expect(page.getByTestId('drift-verdict')).toContainText(/balancer|drift/i);
	await expect(page.getByTestId('drift-table').locator('tbody tr').first()).toBeVisible();
});
