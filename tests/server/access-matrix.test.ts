/**
 * Every route × every visitor, against the built server over HTTP with real sign-ins.
 * The expectations live in tests/access/matrix.ts; the routes are read from src/routes.
 */
import Database from 'better-sqlite3';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { EXPECTED, VISITORS, type Answer, type Check, type Fixtures, type Who } from '../access/matrix';
import { FIELD_CHECKS, type FieldFixtures } from '../access/fields';
import { pdfText } from '../helpers/pdf-text';
import { routeFiles } from '../access/routes';
import { FIELD_ACCESS, ROUTE_ACCESS, maySee, type Field } from '../../src/lib/server/access';
import { ROLES } from '../../src/lib/domain/auth/roles';
import { storePhotos } from '../../src/lib/server/photos';
import { hashToken, newToken } from '../../src/lib/server/track-links';
import { Client, cleanup, DEMO_PEOPLE, ensureBuilt, freshDemoDb, signedIn, startServer, type Reply, type RunningServer } from '../helpers/server';

const PORT = 4260;
const ROUTES = routeFiles();

describe('the matrix covers every route', () => {
	test('every route file has an entry, every entry a route', () => {
		const ids = ROUTES.map((r) => r.id);
		expect(ids.filter((id) => !(id in EXPECTED)), 'routes without expectations in tests/access/matrix.ts').toEqual([]);
		expect(Object.keys(EXPECTED).filter((id) => !ids.includes(id)), 'expectations for routes that do not exist').toEqual([]);
		expect(Object.keys(ROUTE_ACCESS).sort(), 'the matrix and ROUTE_ACCESS name the same routes').toEqual(Object.keys(EXPECTED).sort());
	});

	test('every exported method and form action has a check; every page a GET', () => {
		const gaps: string[] = [];
		for (const r of ROUTES) {
			const checks = EXPECTED[r.id]?.checks ?? [];
			if (r.isPage && !checks.some((c) => c.method === 'GET' && !c.action)) gaps.push(`${r.id} GET`);
			for (const m of r.methods) if (!checks.some((c) => c.method === m && !c.action)) gaps.push(`${r.id} ${m}`);
			for (const a of r.actions) if (!checks.some((c) => c.action === a)) gaps.push(`${r.id} ?/${a}`);
			for (const c of checks) {
				if (c.action && !r.actions.includes(c.action)) gaps.push(`${r.id} ?/${c.action} is checked but not declared`);
				if (!c.action && !r.isPage && !r.methods.includes(c.method)) gaps.push(`${r.id} ${c.method} is checked but not exported`);
			}
		}
		expect(gaps).toEqual([]);
	});
});

describe('routes × visitors on the built server', () => {
	let server: RunningServer;
	let dir: string;
	let fixtures: Fixtures;
	let fieldFixtures: FieldFixtures;
	const clients = new Map<Who, Client>();

	beforeAll(async () => {
		await ensureBuilt();
		const db = await freshDemoDb();
		dir = db.dir;
		const uploads = join(dir, 'uploads');
		const conn = new Database(db.file);
		const u = conn.prepare(`select serial from unit order by id limit 1`).get() as { serial: string };
		const s = conn.prepare(`select code from station where code = 'WASH'`).get() as { code: string };
		const lot = conn.prepare(`select code from core_lot order by id limit 1`).get() as { code: string };
		const model = conn.prepare(`select code from turbo_model order by id limit 1`).get() as { code: string };
		// The customer: a live status link on a demo order, with one teardown photo shared on it.
		const order = conn.prepare(`select id, unit_id as unitId from rebuild_order order by id limit 1`).get() as { id: number; unitId: number };
		const office = conn.prepare(`select id from user where role = 'office' limit 1`).pluck().get() as string;
		const token = newToken();
		const now = Date.now();
		conn.prepare(`insert into track_link (order_id, token_hash, created_at, expires_at) values (?, ?, ?, ?)`).run(order.id, hashToken(token), now, now + 86_400_000);
		process.env.UPLOADS_DIR = uploads;
		const stored = await storePhotos([{ name: 'housing.png', bytes: await sharp({ create: { width: 8, height: 6, channels: 3, background: '#556677' } }).png().toBuffer() }]);
		if (!stored.ok) throw new Error(stored.message);
		const p = stored.photos[0];
		const photoId = Number(
			conn.prepare(`insert into unit_photo (unit_id, sha256, mime, bytes, width, height, original_name, user_id, at) values (?, ?, ?, ?, ?, ?, ?, ?, ?)`).run(order.unitId, p.sha256, p.mime, p.bytes, p.width, p.height, p.originalName, office, now).lastInsertRowid
		);
		conn.prepare(`insert into unit_photo_share (photo_id, order_id, shared, caption, user_id, at) values (?, ?, 1, '', ?, ?)`).run(photoId, order.id, office, now);
		fieldFixtures = fieldFixturesIn(conn, lot.code, now);
		conn.close();
		fixtures = { serial: u.serial, stationCode: s.code, lotCode: lot.code, modelCode: model.code, token, sharedPhotoId: photoId };
		server = await startServer(db.file, PORT, { UPLOADS_DIR: uploads, TRACK_RATE_LIMIT: '1000' });
		for (const who of ['owner', 'lead', 'tech', 'office'] as const) clients.set(who, await signedIn(server.origin, who));
		clients.set('anon', new Client(server.origin));
		clients.set('customer', new Client(server.origin));
	}, 240_000);

	afterAll(async () => {
		for (const c of clients.values()) c.close();
		await server?.stop();
		if (dir) cleanup(dir);
	});

	async function send(client: Client, path: string, check: Check): Promise<Reply> {
		if (check.action) {
			const url = check.action === 'default' ? path : `${path}?/${check.action}`;
			return client.postForm(url, {});
		}
		if (check.method === 'GET') return client.get(path, { headOnly: check.stream });
		return client.request(check.method, path, {
			headers: { 'content-type': 'application/json', origin: client.origin },
			body: JSON.stringify(check.json ?? {})
		});
	}

	function verdict(r: Reply, isApi: boolean, check: Check): Answer | string {
		const loc = String(r.headers.location ?? '');
		if (r.status >= 500) return `server error ${r.status}`;
		if (r.status === 401) return 'login';
		if (r.status === 303 && loc.startsWith('/login?next=')) return 'login';
		if (r.status === 403) return 'forbidden';
		if (r.status >= 300 && r.status < 400 && (check.method === 'GET' || check.endsSession)) return 'redirect';
		if (check.method !== 'GET') return 'pass'; // through the gate: the handler answered (400, 404, 2xx, 3xx)
		if (r.status === 404) return 'missing';
		if (r.status === 200 && check.method === 'GET') return 'ok';
		return isApi && check.method === 'GET' ? `status ${r.status}` : 'pass';
	}

	const rows = Object.entries(EXPECTED).flatMap(([id, e]) => e.checks.map((check) => ({ id, e, check })));
	let checked = 0;

	test.each(rows.map((r) => [`${r.check.method}${r.check.action ? ` ?/${r.check.action}` : ''} ${r.id}`, r] as const))('%s', async (_name, { id, e, check }) => {
		const got: Partial<Record<Who, string>> = {};
		for (const who of VISITORS) {
			let client = clients.get(who)!;
			let own: Client | undefined;
			if (check.endsSession && who !== 'anon' && who !== 'customer') {
				own = await signedIn(server.origin, who as keyof typeof DEMO_PEOPLE);
				client = own;
			}
			const r = await send(client, e.path(fixtures, who), check);
			let v = verdict(r, id.startsWith('/api/'), check);
			// 'pass' covers ok and a redirect after a mutation
			if (check.answers[who] === 'pass' && v === 'ok') v = 'pass';
			got[who] = v;
			own?.close();
			checked++;
		}
		expect(got).toEqual(check.answers);
	});

	test('the signed-in sessions were not disturbed by the matrix', async () => {
		for (const who of ['owner', 'lead', 'tech', 'office'] as const) {
			expect((await clients.get(who)!.get('/api/stations')).status, who).toBe(200);
		}
		console.log(`access matrix: ${rows.length} checks × ${VISITORS.length} visitors = ${checked} requests`);
	});

	describe('field visibility: each role gets a field exactly when FIELD_ACCESS lets it see it', () => {
		/** The bodies to search: a page's HTML and its __data.json, or the answer as it is. */
		async function bodies(client: Client, path: string, kind: string): Promise<{ kind: 'html' | 'data' | 'json' | 'csv' | 'pdf'; status: number; text: string }[]> {
			if (kind === 'page') {
				const [p, q] = path.split('?');
				const html = await client.get(path);
				const data = await client.get(`${p === '/' ? '' : p}/__data.json${q ? `?${q}` : ''}`);
				return [
					{ kind: 'html', status: html.status, text: html.text },
					{ kind: 'data', status: data.status, text: data.text }
				];
			}
			const r = await client.get(path);
			return [{ kind: kind as 'json' | 'csv' | 'pdf', status: r.status, text: kind === 'pdf' ? pdfText(r.bytes) : r.text }];
		}

		test.each(FIELD_CHECKS.map((c) => [c.name, c] as const))('%s', async (_name, c) => {
			const got: Record<string, Record<string, boolean>> = {};
			const want: Record<string, Record<string, boolean>> = {};
			for (const role of ROLES) {
				for (const b of await bodies(clients.get(role)!, c.path(fieldFixtures), c.kind)) {
					expect(b.status, `${role} ${b.kind} ${c.path(fieldFixtures)}`).toBeLessThan(500);
					for (const [field, needles] of Object.entries(c.carries) as [Field, NonNullable<(typeof c.carries)[Field]>][]) {
						const found = needles(fieldFixtures, b.kind).map((n) => b.text.includes(n));
						const key = `${role} ${b.kind} ${field}`;
						// all of the field's values, or none of them
						got[key] = { all: found.every(Boolean), none: !found.some(Boolean) };
						want[key] = maySee(role, field) ? { all: true, none: false } : { all: false, none: true };
					}
					for (const [field, needles] of Object.entries(c.never ?? {}) as [Field, NonNullable<(typeof c.carries)[Field]>][]) {
						const key = `${role} ${b.kind} ${field} (never on this page)`;
						got[key] = { all: false, none: !needles(fieldFixtures, b.kind).some((n) => b.text.includes(n)) };
						want[key] = { all: false, none: true };
					}
				}
			}
			expect(got).toEqual(want);
		});

		test('every field rule names at least one role, and the owner sees every field', () => {
			for (const [field, roles] of Object.entries(FIELD_ACCESS)) {
				expect(roles.length, field).toBeGreaterThan(0);
				expect(maySee('owner', field as Field), field).toBe(true);
			}
			expect(FIELD_CHECKS.length).toBeGreaterThan(15);
		});
	});
});

/**
 * Known values to search for: a lot with a price per core found nowhere else, the second demo
 * customer order with a quote line priced the same way, a shipment to that customer and one to
 * a web buyer, and an open walk-in demand order with its customer.
 */
function fieldFixturesIn(conn: Database.Database, lotCode: string, now: number): FieldFixtures {
	const lotCostCents = 4_321_987;
	conn.prepare(`update core_lot set cost_per_core_cents = ? where code = ?`).run(lotCostCents, lotCode);
	const order = conn
		.prepare(`select o.id, o.code, o.customer_name as name, o.email, o.ship_address as address, o.unit_id as unitId, u.serial from rebuild_order o join unit u on u.id = o.unit_id order by o.id limit 1 offset 1`)
		.get() as { id: number; code: string; name: string; email: string; address: string; unitId: number; serial: string };
	const quotePriceCents = 7_391_937;
	const quoteId = conn.prepare(`select id from quote where order_id = ? order by id desc limit 1`).pluck().get(order.id) as number;
	conn.prepare(`update quote_line set unit_price_cents = ? where id = (select id from quote_line where quote_id = ? order by id limit 1)`).run(quotePriceCents, quoteId);
	const ship = (code: string, destination: string, orderId: number | null, reference: string, shipTo: string, unitId: number) => {
		const id = Number(
			conn
				.prepare(`insert into shipment (code, destination, order_id, reference, ship_to, carrier, tracking_number, created_at) values (?, ?, ?, ?, ?, 'Fenwick Parcel', ?, ?)`)
				.run(code, destination, orderId, reference, shipTo, `FP-${code.slice(-3)}9`, now).lastInsertRowid
		);
		conn.prepare(`insert into shipment_unit (shipment_id, unit_id) values (?, ?)`).run(id, unitId);
		return id;
	};
	const customerShipmentId = ship('SH-FIELD-001', 'customer', order.id, '', `${order.name}\n${order.address}`, order.unitId);
	const stockUnit = conn.prepare(`select id from unit where id not in (select unit_id from rebuild_order) and id not in (select unit_id from shipment_unit) order by id desc limit 1`).pluck().get() as number;
	const webBuyer = 'Quenby Marsh';
	const webShipmentId = ship('SH-FIELD-002', 'web_order', null, 'W-5521', `${webBuyer}\n9 Sallow Row\nFernholt`, stockUnit);
	const walkInCustomer = 'Tamsin Greave Joinery';
	const today = new Date(now).toISOString().slice(0, 10);
	conn.prepare(`insert into customer_order (ref, channel, customer, ordered_on, due_on, status, notes, created_at) values ('FIELD-WALKIN-1', 'walk_in', ?, ?, ?, 'open', '', ?)`).run(walkInCustomer, today, today, now);
	return {
		lotCode,
		lotCostCents,
		orderId: order.id,
		customerName: order.name,
		customerEmail: order.email,
		quotePriceCents,
		customerShipmentId,
		customerShipTo: order.name,
		webShipmentId,
		webBuyer,
		customerSerial: order.serial,
		walkInCustomer
	};
}
