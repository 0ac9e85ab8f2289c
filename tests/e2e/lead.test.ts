import { expect, test, type Page } from '@playwright/test';
import { signIn } from './helpers';

const board = (page: Page) => page.getByTestId('card-board');
const titles = (page: Page) => board(page).getByTestId('card-title');
const handleOf = (page: Page, title: string) => board(page).getByTestId('card-item').filter({ hasText: title }).getByTestId('card-handle');
const firstQueueCard = (page: Page) => page.getByTestId('queue').locator('tbody tr').first().getByTestId('queue-card');

async function hydrated(page: Page) {
	await expect(board(page)).toHaveAttribute('data-ready', 'true');
}

test('the lead reorders cards by mouse and by keyboard; a station board follows without a reload', async ({ browser }) => {
	const leadCtx = await browser.newContext();
	const techCtx = await browser.newContext();
	const lead = await leadCtx.newPage();
	const tech = await techCtx.newPage();
	await signIn(lead, 'lead');
	await signIn(tech, 'tech');

	await tech.goto('/stations/TEARDOWN-1');
	await expect(tech.getByTestId('queue')).toBeVisible();
	await tech.evaluate(() => ((window as unknown as { __noReload: number }).__noReload = 42));
	await expect(firstQueueCard(tech)).toContainText('Restock CH-V55 for Coast Depot');

	await lead.goto('/cards');
	await hydrated(lead);
	await expect(titles(lead).first()).toHaveText('Rush — Bramble Lane Haulage truck is waiting');

	// mouse: drag "Conversion kits" (5th) above the first card
	const kits = handleOf(lead, 'Conversion kits for the swap shop');
	const top = await board(lead).getByTestId('card-item').first().boundingBox();
	const from = await kits.boundingBox();
	if (!top || !from) throw new Error('no boxes');
	await lead.mouse.move(from.x + from.width / 2, from.y + from.height / 2);
	await lead.mouse.down();
	await lead.mouse.move(from.x + from.width / 2, from.y + from.height / 2 - 10, { steps: 4 });
	await lead.mouse.move(top.x + from.width / 2, top.y + 4, { steps: 20 });
	await lead.mouse.move(top.x + from.width / 2, top.y + 2, { steps: 4 });
	await lead.mouse.up();
	await expect(lead.getByTestId('board-status')).toContainText('“Conversion kits for the swap shop” is now 1 on the board.');
	await expect(titles(lead).first()).toHaveText('Conversion kits for the swap shop');

	// the second browser shows the new first unit without a reload
	await expect(firstQueueCard(tech)).toContainText('Conversion kits for the swap shop');
	await expect(tech.getByTestId('queue').locator('tbody tr').first()).toContainText('CH-K60');

	// keyboard: Space, arrows, Space moves "Restock CH-V55" (now 4th) to the top
	await lead.reload();
	await hydrated(lead);
	const restock = handleOf(lead, 'Restock CH-V55 for Coast Depot');
	await restock.focus();
	// at a person's pace: the zone re-renders between key presses
	await lead.keyboard.press('Space');
	await lead.waitForTimeout(250);
	for (let i = 0; i < 3; i++) {
		await lead.keyboard.press('ArrowUp');
		await lead.waitForTimeout(250);
	}
	await lead.keyboard.press('Space');
	await expect(lead.getByTestId('board-status')).toContainText('“Restock CH-V55 for Coast Depot” is now 1 on the board.');
	await expect(titles(lead)).toHaveText([
		'Restock CH-V55 for Coast Depot',
		'Conversion kits for the swap shop',
		'Rush — Bramble Lane Haulage truck is waiting',
		'Customer rebuilds promised for Friday',
		'Finish the older skid on the lathes first'
	]);

	await expect(firstQueueCard(tech)).toContainText('Restock CH-V55 for Coast Depot');
	await expect(tech.getByTestId('queue').locator('tbody tr').first()).toContainText('CH-V55');
	expect(await tech.evaluate(() => (window as unknown as { __noReload?: number }).__noReload)).toBe(42);

	// the change log says who moved what
	await lead.reload();
	await expect(lead.getByTestId('card-log').locator('tbody tr').first()).toContainText('Tomas Okafor');
	await expect(lead.getByTestId('card-log')).toContainText('reordered');
	await leadCtx.close();
	await techCtx.close();
});

test('the lead moves several units from one card to another', async ({ page }) => {
	await signIn(page, 'lead');
	await page.goto('/cards');
	await hydrated(page);
	const rush = page.getByTestId('card-units').filter({ hasText: 'Rush — Bramble Lane' });
	const friday = page.getByTestId('card-units').filter({ hasText: 'Customer rebuilds promised' });
	const rushBoxes = rush.getByRole('checkbox');
	const before = { rush: await rushBoxes.count(), friday: await friday.getByRole('checkbox').count() };
	expect(before.rush).toBeGreaterThanOrEqual(2);
	const picked = [await rushBoxes.nth(0).getAttribute('value'), await rushBoxes.nth(1).getAttribute('value')];
	await rushBoxes.nth(0).check();
	await rushBoxes.nth(1).check();
	await page.getByTestId('move-to').selectOption({ label: 'Customer rebuilds promised for Friday' });
	await page.getByTestId('move-units').click();
	await expect(page.getByTestId('card-feedback')).toContainText('Moved 2 units.');
	await expect(rushBoxes).toHaveCount(before.rush - 2);
	await expect(friday.getByRole('checkbox')).toHaveCount(before.friday + 2);
	for (const s of picked) await expect(friday).toContainText(s!);
});

test('a tech may watch the board but not change it', async ({ page, baseURL }) => {
	await signIn(page, 'tech');
	await page.goto('/cards');
	await expect(page.getByText('Watching only')).toBeVisible();
	await expect(page.getByTestId('card-handle')).toHaveCount(0);
	await expect(page.getByTestId('card-form')).toHaveCount(0);

	const form = await page.request.post('/cards?/create', {
		headers: { origin: baseURL!, 'x-sveltekit-action': 'true' },
		form: { title: 'Mine first', style: 'rush', kind: 'rule', ruleModel: 'CH-F46' }
	});
	expect(form.status()).toBe(403);
	expect(await form.text()).toContain('may not do this here');

	const api = await page.request.put('/api/cards/order', { headers: { origin: baseURL! }, data: { order: [] } });
	expect(api.status()).toBe(403);
	expect((await api.json()).error.code).toBe('forbidden');

	await page.goto('/cards');
	await expect(page.getByTestId('card-title')).toHaveCount(5);
	await expect(page.getByTestId('card-title').filter({ hasText: 'Mine first' })).toHaveCount(0);
});

test('the office imports an order file: bad rows are listed and nothing is imported until they are fixed', async ({ page }) => {
	await signIn(page, 'office');
	await page.goto('/demand/import');
	await page.getByLabel('…or paste the rows').fill('Order No,Depot,Part,Qty,Due\nE2E-1,Coast,CH-V55,4,2099-12-14\nE2E-2,Harbour,CH-V55,1,2099-12-14\n');
	await page.getByTestId('import-preview').click();
	await expect(page.getByTestId('bad-rows')).toContainText('"Harbour" is not a channel');
	await expect(page.getByTestId('import-go')).toBeDisabled();
	await expect(page.getByTestId('map-channel')).toHaveValue('Depot');
	await page.goto('/demand');
	await expect(page.getByTestId('orders')).not.toContainText('E2E-1');

	await page.goto('/demand/import');
	await page.getByLabel('…or paste the rows').fill('Order No,Depot,Part,Qty,Due\nE2E-1,Coast,CH-V55,4,2099-12-14\nE2E-2,Lakes,CH-V55,1,2099-12-14\n');
	await page.getByTestId('import-preview').click();
	await expect(page.getByTestId('good-orders')).toContainText('2 orders, 2 rows');
	await page.getByTestId('import-go').click();
	await expect(page.getByTestId('import-done')).toContainText('Imported 2 orders with 2 lines.');
	await page.goto('/demand');
	await expect(page.getByTestId('orders')).toContainText('E2E-1');
	await expect(page.getByTestId('orders')).toContainText('Lakes Depot');
});

test('two people edit one card: the stale save gets the conflict and the current card, nothing is overwritten', async ({ browser }) => {
	const a = await (await browser.newContext()).newPage();
	const b = await (await browser.newContext()).newPage();
	await signIn(a, 'owner');
	await signIn(b, 'lead');
	for (const p of [a, b]) {
		await p.goto('/cards');
		await hydrated(p);
		await board(p).getByTestId('card-item').filter({ hasText: 'Finish the older skid' }).getByRole('button', { name: 'Edit' }).click();
	}
	await a.getByLabel('Title').fill('Finish the older skid first — both lathes');
	await a.getByTestId('card-save').click();
	await expect(a.getByTestId('card-feedback')).toContainText('Saved “Finish the older skid first — both lathes”.');

	await b.getByLabel('Title').fill('Older skid: no hurry');
	await b.getByTestId('card-save').click();
	const conflict = b.getByTestId('conflict');
	await expect(conflict).toContainText('Ines Varga changed “Finish the older skid first — both lathes”');
	await expect(conflict).toContainText('Nothing of yours was saved');
	await expect(b.getByLabel('Title')).toHaveValue('Finish the older skid first — both lathes');
	await expect(titles(b).filter({ hasText: 'Older skid: no hurry' })).toHaveCount(0);

	// saving again from the current state goes through
	await b.getByLabel('Due date').fill('2099-01-31');
	await b.getByTestId('card-save').click();
	await expect(b.getByTestId('card-feedback')).toContainText('Saved “Finish the older skid first — both lathes”.');
	await expect(board(b).getByTestId('card-item').filter({ hasText: 'both lathes' })).toContainText('due 2099-01-31');
});

test('the build plan turns a suggestion into a card', async ({ page }) => {
	await signIn(page, 'lead');
	await page.goto('/plan');
	const row = page.getByTestId('plan').locator('tbody tr').filter({ has: page.getByRole('button', { name: 'Make a card' }) }).first();
	const model = await row.getAttribute('data-model');
	await row.getByRole('button', { name: 'Make a card' }).click();
	await expect(page.getByTestId('plan-done')).toContainText(`× ${model} this week`);
	await page.goto('/cards');
	await expect(titles(page).last()).toContainText(`× ${model} this week`);
});
