/** Filling the assembly and balance bench forms in browser tests. */
import { expect, type Page } from '@playwright/test';

/** Fill the assembly form; the wastegate preset goes in the middle of the model's window when it has one. */
export async function fillAssembly(page: Page, endPlay: string, radialPlay = '0.45') {
	await page.getByTestId('end-play').fill(endPlay);
	await page.getByTestId('radial-play').fill(radialPlay);
	const wg = page.getByTestId('wastegate');
	if (await wg.count()) {
		const [lo, hi] = (await wg.getAttribute('data-window'))!.split('-').map(Number);
		await wg.fill(String(Math.round((lo + hi) / 2)));
	}
	for (const [id, v] of [['bearingKitLot', 'BK-2901'], ['sealKitLot', 'SK-2902'], ['compWheelSerial', 'CW-600001'], ['shaftWheelSerial', 'SW-600002']]) {
		await page.getByTestId(id).fill(v);
	}
}

export async function recordAssembly(page: Page, serial: string) {
	await page.goto(`/units/${serial}/assembly?station=BUILD-1`);
	await fillAssembly(page, '0.05');
	await page.getByTestId('record-assembly').click();
	await expect(page.getByTestId('assembly-saved')).toContainText('within limits');
}

export async function recordPassingRun(page: Page, serial: string) {
	await page.goto(`/units/${serial}/balance?station=BALANCE`);
	await page.getByTestId('comp-amount').fill('0.1');
	await page.getByTestId('comp-angle').fill('10');
	await page.getByTestId('turb-amount').fill('0.1');
	await page.getByTestId('turb-angle').fill('100');
	await expect(page.getByTestId('live-verdict')).toContainText('Within allowance');
	await page.getByTestId('record-run').click();
	await expect(page.getByTestId('run-saved')).toContainText('pass');
}
