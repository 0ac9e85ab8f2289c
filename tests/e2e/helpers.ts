import { expect, type Page } from '@playwright/test';
import { PNG } from 'pngjs';

export const PEOPLE = {
	owner: { email: 'ines@corvidhill.example', password: 'owner-demo-2026' },
	lead: { email: 'tomas@corvidhill.example', password: 'lead-demo-2026' },
	tech: { email: 'rui@corvidhill.example', password: 'tech-demo-2026' },
	tech2: { email: 'dana@corvidhill.example', password: 'tech-demo-2026' },
	office: { email: 'priya@corvidhill.example', password: 'office-demo-2026' }
} as const;

export async function signIn(page: Page, who: keyof typeof PEOPLE) {
	await page.goto('/login');
	await page.getByLabel('E-mail').fill(PEOPLE[who].email);
	await page.getByLabel('Password').fill(PEOPLE[who].password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByTestId('whoami')).toBeVisible();
}

/** Scan a serial into the station page's scan box the way a keyboard-wedge scanner does. */
export async function scan(page: Page, serial: string) {
	const box = page.getByTestId('scan-input');
	await expect(box).toBeEnabled();
	await box.fill(serial);
	await box.press('Enter');
}

/** A small solid-colour PNG, as a camera upload stands in for in tests. */
export function smallPng(width = 24, height = 16, rgb: [number, number, number] = [63, 111, 209]): Buffer {
	const png = new PNG({ width, height });
	for (let i = 0; i < png.data.length; i += 4) png.data.set([...rgb, 255], i);
	return PNG.sync.write(png);
}
