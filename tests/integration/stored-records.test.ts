/**
 * Pages that show stored records never fail on what is stored. Rows are written straight into
 * the database (as an older version of the app might have left them), then every reader of the
 * unit's history is asked for it and its answer is serialised the way SvelteKit sends page data
 * (devalue `stringify` for __data.json, `uneval` for the page itself).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import * as devalue from 'devalue';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { testShop, type TestShop } from '../helpers/db';
import { unit } from '../../src/lib/server/db/schema';
import { applyMove } from '../../src/lib/server/units';

const dir = mkdtempSync(join(tmpdir(), 'spoolyard-stored-'));
const dbFile = join(dir, 'api.db');
process.env.DATABASE_URL = dbFile;

let shop: TestShop;
let unitPage: typeof import('../../src/routes/(app)/units/[serial=serial]/+page.server');
let printPage: typeof import('../../src/routes/(print)/units/[serial=serial]/print/+page.server');
let historyApi: typeof import('../../src/routes/api/units/[serial=serial]/+server');
let lotPage: typeof import('../../src/routes/(app)/lots/[code=code]/+page.server');
let boardApi: typeof import('../../src/routes/api/stations/[code=code]/board/+server');

beforeAll(async () => {
	shop = testShop(dbFile);
	unitPage = await import('../../src/routes/(app)/units/[serial=serial]/+page.server');
	printPage = await import('../../src/routes/(print)/units/[serial=serial]/print/+page.server');
	historyApi = await import('../../src/routes/api/units/[serial=serial]/+server');
	lotPage = await import('../../src/routes/(app)/lots/[code=code]/+page.server');
	boardApi = await import('../../src/routes/api/stations/[code=code]/board/+server');
}, 60_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const deep = (levels: number) => '['.repeat(levels) + ']'.repeat(levels);

/** Hostile `data` texts, each as an older version could have stored it. */
const HOSTILE: Record<string, string> = {
	'4,000 levels of nesting beside a reason': `{"reason":"x y z","x":${deep(4000)}}`,
	'20,000 levels of nesting': `{"x":${deep(20000)}}`,
	'markup, wrong types and a 1 MB string': JSON.stringify({ reason: '<script>alert(1)</script>', reasonCode: { nested: true }, toStage: 7, blob: 'A'.repeat(1_000_000) }),
	'an array where an object belongs': '[1,2,3]',
	'text that is not JSON at all': 'not json {',
	'a bare string': '"just words"'
};

function withHostileRow(dataText: string): string {
	const [serial] = shop.receive();
	expect(applyMove(shop.db, shop.actors.tech, { serial, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: `stored-${serial}-1` }).ok).toBe(true);
	const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	shop.db.$client
		.prepare(
			`insert into unit_event (unit_id, seq, from_state, to_state, action, station_id, user_id, at, idempotency_key, note, data)
			 values (?, ?, 'inspected', 'inspected', 'hold', null, ?, ?, ?, ?, ?)`
		)
		.run(u.id, u.version + 1, shop.actors.lead.id, Date.now(), `stored-${serial}-hostile`, '<b>note</b>', dataText);
	shop.db.$client.prepare('update unit set held = 1, hold_reason = ?, version = version + 1 where id = ?').run('x y z', u.id);
	return serial;
}

const locals = () => ({ user: { id: shop.actors.tech.id, role: 'tech', name: 'Test tech', email: '', active: true }, session: null });

describe('a hostile stored row', () => {
	test.each(Object.entries(HOSTILE))('%s: the unit page, print page, history API, lot page and board still answer', async (_, text) => {
		const serial = withHostileRow(text);

		const page = await unitPage.load({ params: { serial }, locals: locals(), url: new URL(`http://localhost/units/${serial}`) } as never);
		// what /units/SY-x/__data.json and the rendered page send
		const data = devalue.stringify(page);
		expect(devalue.uneval(page).length).toBeGreaterThan(0);
		expect(data.length).toBeLessThan(200_000);
		const last = (page as { history: { data: Record<string, unknown> | null }[] }).history.at(-1)!;
		expect(last.data?.unshown).toBeTypeOf('string');
		expect(String(last.data?.unshown).length).toBeLessThanOrEqual(400);
		expect(last.data?.notice).toMatch(/stored data could not be shown in full/i);

		const print = await printPage.load({ params: { serial }, locals: locals(), url: new URL(`http://localhost/units/${serial}/print`) } as never);
		expect(devalue.stringify(print).length).toBeGreaterThan(0);
		expect(devalue.uneval(print).length).toBeGreaterThan(0);

		const api = await historyApi.GET({ params: { serial } } as never);
		expect(api.status).toBe(200);
		const body = await api.json();
		expect(body.history).toHaveLength(3);

		const lot = await lotPage.load({ params: { code: 'L-TEST-1' }, locals: locals(), url: new URL('http://localhost/lots/L-TEST-1') } as never);
		expect(devalue.stringify(lot).length).toBeGreaterThan(0);

		const board = await boardApi.GET({ params: { code: 'TEARDOWN-1' }, request: new Request('http://localhost/x') } as never);
		expect(board.status).toBe(200);
	});

	test('known fields of a stored row are still shown beside the note', async () => {
		const serial = withHostileRow(HOSTILE['4,000 levels of nesting beside a reason']);
		const page = (await unitPage.load({ params: { serial }, locals: locals(), url: new URL(`http://localhost/units/${serial}`) } as never)) as {
			history: { data: Record<string, unknown> | null }[];
		};
		expect(page.history.at(-1)!.data).toMatchObject({ reason: 'x y z', notice: expect.stringMatching(/could not be shown in full/) });
	});

	test('wrongly typed known fields are not passed on as they are', async () => {
		const serial = withHostileRow(HOSTILE['markup, wrong types and a 1 MB string']);
		const page = (await unitPage.load({ params: { serial }, locals: locals(), url: new URL(`http://localhost/units/${serial}`) } as never)) as {
			history: { data: Record<string, unknown> | null }[];
		};
		const d = page.history.at(-1)!.data!;
		expect(d.reason).toBe('<script>alert(1)</script>');
		expect(d.reasonCode).toBeUndefined();
		expect(d.toStage).toBeUndefined();
		expect(d.blob).toBeUndefined();
		expect(String(d.unshown)).toContain('reasonCode');
	});

	test('ordinary rows carry no note', async () => {
		const [serial] = shop.receive();
		expect(applyMove(shop.db, shop.actors.lead, { serial, action: 'hold', idempotencyKey: `plain-${serial}`, data: { reason: 'waiting for a wheel' } }).ok).toBe(true);
		const page = (await unitPage.load({ params: { serial }, locals: locals(), url: new URL(`http://localhost/units/${serial}`) } as never)) as {
			history: { data: Record<string, unknown> | null }[];
		};
		expect(page.history.at(-1)!.data).toEqual({ reason: 'waiting for a wheel' });
	});
});
