/**
 * The built server answers every page that shows a unit's record with 200, whatever an older
 * version left in its append-only history: a row is written straight into the database file (as
 * such a row would have been), then each role opens the unit page, its print page and their
 * __data.json, and the history API.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { openDatabase } from '../../src/lib/server/db/index';
import { unit, user } from '../../src/lib/server/db/schema';
import { prepareUnits } from '../helpers/shop-prep';
import { DEMO_PEOPLE, cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type Client, type RunningServer } from '../helpers/server';

const PORT = 4268;
let server: RunningServer;
let dir: string;
let serial: string;

beforeAll(async () => {
	await ensureBuilt();
	let file: string;
	({ dir, file } = await freshDemoDb());
	[serial] = prepareUnits(file, 1, [['inspect', 'TEARDOWN-1']]);
	const db = openDatabase(file);
	try {
		const u = db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		const lead = db.select().from(user).where(eq(user.email, DEMO_PEOPLE.lead.email)).get()!;
		const deep = '['.repeat(4000) + ']'.repeat(4000);
		db.$client
			.prepare(
				`insert into unit_event (unit_id, seq, from_state, to_state, action, user_id, at, idempotency_key, note, data)
				 values (?, ?, 'inspected', 'inspected', 'hold', ?, ?, ?, ?, ?)`
			)
			.run(u.id, u.version + 1, lead.id, Date.now(), `stored-${serial}-deep`, null, `{"reason":"x y z","x":${deep},"tag":"<script>alert(1)</script>"}`);
		db.$client
			.prepare(
				`insert into unit_event (unit_id, seq, from_state, to_state, action, user_id, at, idempotency_key, note, data)
				 values (?, ?, 'inspected', 'inspected', 'release', ?, ?, ?, ?, ?)`
			)
			.run(u.id, u.version + 2, lead.id, Date.now(), `stored-${serial}-bad`, null, 'not json {');
		db.$client.prepare('update unit set version = version + 2 where id = ?').run(u.id);
	} finally {
		db.$client.close();
	}
	server = await startServer(file, PORT);
}, 300_000);

afterAll(async () => {
	await server?.stop();
	if (dir) cleanup(dir);
});

test('every role gets 200 from the unit page, print page, their __data.json and the history API', async () => {
	for (const who of ['owner', 'lead', 'tech', 'office'] as const) {
		const c: Client = await signedIn(server.origin, who);
		try {
			for (const path of [`/units/${serial}`, `/units/${serial}/print`, `/units/${serial}/__data.json`, `/units/${serial}/print/__data.json`, `/api/units/${serial}`]) {
				const r = await c.get(path);
				expect(r.status, `${who} ${path}: ${r.text.slice(0, 200)}\n${server.log().slice(-1000)}`).toBe(200);
			}
			const page = await c.get(`/units/${serial}`);
			expect(page.text).toContain('Stored data could not be shown in full.');
			expect(page.text).toMatch(/&lt;script(&gt;|>)alert\(1\)&lt;\/script/);
			expect(page.text).not.toContain('<script>alert(1)</script>');
		} finally {
			c.close();
		}
	}
}, 120_000);
