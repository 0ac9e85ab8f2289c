import { expect, test } from '@playwright/test';
import { scan, signIn } from './helpers';

interface HistoryBody {
	unit: { serial: string; state: string; held: boolean };
	history: { action: string }[];
}

test('scans made with the link down wait on the board, arrive once when it is back, and a refused one is shown to the tech', async ({ browser, baseURL }) => {
	const techContext = await browser.newContext();
	const tech = await techContext.newPage();
	await signIn(tech, 'tech');
	await tech.goto('/stations/WASH');
	await expect(tech.getByTestId('live-status')).toHaveAttribute('data-status', 'open');
	const rows = tech.getByTestId('queue').locator('tbody tr');
	await expect(rows.nth(2)).toBeVisible();
	const serials = await Promise.all([0, 1, 2].map(async (i) => (await rows.nth(i).getAttribute('data-serial'))!));
	expect(new Set(serials).size).toBe(3);

	// the shop's Wi-Fi drops
	await techContext.setOffline(true);
	for (const [i, serial] of serials.entries()) {
		await scan(tech, serial);
		await expect(tech.getByTestId('scan-queued')).toContainText(serial);
		await expect(tech.getByTestId('scans-waiting')).toContainText(`${i + 1} scan${i ? 's' : ''} waiting to send`);
	}
	await expect(tech.getByTestId('scans-waiting')).toContainText('3 scans waiting to send');
	// a reload while offline is not possible, but the queue lives in IndexedDB, not in the page
	const stored = await tech.evaluate(
		() =>
			new Promise<number>((resolve, reject) => {
				const open = indexedDB.open('spoolyard');
				open.onsuccess = () => {
					const req = open.result.transaction('scan-queue').objectStore('scan-queue').get('waiting');
					req.onsuccess = () => resolve((req.result ?? []).length);
					req.onerror = () => reject(req.error);
				};
				open.onerror = () => reject(open.error);
			})
	);
	expect(stored).toBe(3);

	// meanwhile the lead, on another screen, holds the last of them
	const leadContext = await browser.newContext();
	const lead = await leadContext.newPage();
	await signIn(lead, 'lead');
	const held = await lead.request.post(`/api/units/${serials[2]}/events`, {
		headers: { origin: baseURL! },
		data: { action: 'hold', idempotencyKey: `e2e-hold-${Date.now()}`, data: { reason: 'Housing crack seen on the wash rack' } }
	});
	expect(held.status()).toBe(201);

	// the link comes back: the queue sends itself, oldest first
	await techContext.setOffline(false);
	await expect(tech.getByTestId('scans-waiting')).toHaveCount(0, { timeout: 20_000 });
	const refused = tech.locator(`[data-testid="needs-you-item"][data-serial="${serials[2]}"]`);
	await expect(refused).toBeVisible();
	await expect(refused.getByTestId('needs-you-message')).toContainText('hold');
	await expect(tech.getByTestId('needs-you-item')).toHaveCount(1);

	for (const serial of serials.slice(0, 2)) {
		const body = (await (await lead.request.get(`/api/units/${serial}`)).json()) as HistoryBody;
		expect(body.unit.state).toBe('cleaned');
		expect(body.history.filter((e) => e.action === 'clean')).toHaveLength(1);
		await expect(tech.getByTestId('queue').locator(`tr[data-serial="${serial}"]`)).toHaveCount(0);
		await expect(tech.getByTestId('done-today')).toContainText(serial);
	}
	const heldBody = (await (await lead.request.get(`/api/units/${serials[2]}`)).json()) as HistoryBody;
	expect(heldBody.unit).toMatchObject({ state: 'accepted', held: true });
	expect(heldBody.history.filter((e) => e.action === 'clean')).toHaveLength(0);

	// the tech has seen it; dismissing leaves the unit where the server has it
	await refused.getByTestId('needs-you-dismiss').click();
	await expect(tech.getByTestId('needs-you')).toHaveCount(0);
	await tech.reload();
	await expect(tech.getByTestId('needs-you')).toHaveCount(0);
	await expect(tech.getByTestId('scans-waiting')).toHaveCount(0);

	await techContext.close();
	await leadContext.close();
});
