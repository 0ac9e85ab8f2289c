import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { PNG } from 'pngjs';
import sharp from 'sharp';
import { testShop, type TestShop } from '../helpers/db';
import { checklist, checklistItem, inspection, inspectionAnswer, unit, unitEvent, unitPhoto } from '../../src/lib/server/db/schema';
import { replay } from '../../src/lib/domain/units/machine';
import { applyMove } from '../../src/lib/server/units';
import { stationBoard } from '../../src/lib/server/board';
import { undoLastMove } from '../../src/lib/server/undo';
import type { Role } from '../../src/lib/domain/auth/roles';

const dir = mkdtempSync(join(tmpdir(), 'spoolyard-boards-'));
const dbFile = join(dir, 'boards.db');
const uploads = join(dir, 'uploads');
process.env.DATABASE_URL = dbFile;
process.env.UPLOADS_DIR = uploads;

let shop: TestShop;
type Routes = {
	board: (typeof import('../../src/routes/api/stations/[code=code]/board/+server'))['GET'];
	events: (typeof import('../../src/routes/api/units/[serial=serial]/events/+server'))['POST'];
	undo: (typeof import('../../src/routes/api/units/[serial=serial]/undo/+server'))['POST'];
	inspect: (typeof import('../../src/routes/api/units/[serial=serial]/inspection/+server'))['POST'];
	photo: (typeof import('../../src/routes/api/photos/[sha=sha256]/+server'))['GET'];
	stream: (typeof import('../../src/routes/api/stream/+server'))['GET'];
};
let r: Routes;
let itemIds: number[] = [];

beforeAll(async () => {
	shop = testShop(dbFile);
	r = {
		board: (await import('../../src/routes/api/stations/[code=code]/board/+server')).GET,
		events: (await import('../../src/routes/api/units/[serial=serial]/events/+server')).POST,
		undo: (await import('../../src/routes/api/units/[serial=serial]/undo/+server')).POST,
		inspect: (await import('../../src/routes/api/units/[serial=serial]/inspection/+server')).POST,
		photo: (await import('../../src/routes/api/photos/[sha=sha256]/+server')).GET,
		stream: (await import('../../src/routes/api/stream/+server')).GET
	};
	// the test shop's model is family F: give it a two-item checklist
	const list = shop.db.insert(checklist).values({ family: 'F', name: 'F teardown' }).returning().get();
	itemIds = ['Turbine housing cracks', 'Bearing bore'].map(
		(label, i) => shop.db.insert(checklistItem).values({ checklistId: list.id, label, measureUnit: i === 1 ? 'mm' : null, sortOrder: i }).returning().get().id
	);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

let n = 0;
const key = () => `boards-key-${++n}-${Date.now()}`;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
const locals = (role: Role) => ({ user: { ...shop.actors[role], name: `Test ${role}`, email: '', active: true }, session: null }) as any;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
const call = (handler: any, args: Record<string, unknown>) => handler({ request: new Request('http://localhost/'), ...args }) as Promise<Response>;

function json(url: string, body: unknown, headers: Record<string, string> = {}) {
	return new Request(url, { method: 'POST', headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify(body) });
}

async function scan(serial: string, station: string, role: Role = 'tech') {
	const res = await call(r.events, {
		params: { serial },
		request: json(`http://localhost/api/units/${serial}/events`, { scan: true, stationCode: station, idempotencyKey: key() }, { 'x-spoolyard-scan': '1' }),
		locals: locals(role)
	});
	return { status: res.status, body: await res.json() };
}

function png(w = 16, h = 12): Buffer {
	const p = new PNG({ width: w, height: h });
	for (let i = 0; i < p.data.length; i += 4) p.data.set([40, 90, 200, 255], i);
	return PNG.sync.write(p);
}

function qualifyForm(fields: Record<string, string>, files: { name: string; bytes: Uint8Array; type?: string }[] = []) {
	const fd = new FormData();
	for (const [k, v] of Object.entries(fields)) fd.set(k, v);
	for (const f of files) fd.append('photos', new File([new Uint8Array(f.bytes)], f.name, { type: f.type ?? 'application/octet-stream' }));
	return fd;
}

async function qualify(serial: string, fields: Record<string, string>, files: { name: string; bytes: Uint8Array; type?: string }[] = []) {
	const fd = qualifyForm({ stationCode: 'TEARDOWN-1', idempotencyKey: key(), ...fields }, files);
	const res = await call(r.inspect, { params: { serial }, request: new Request(`http://localhost/api/units/${serial}/inspection`, { method: 'POST', body: fd }), locals: locals('tech') });
	return { status: res.status, body: await res.json() };
}

const allPass = () => ({ [`result-${itemIds[0]}`]: 'pass', [`result-${itemIds[1]}`]: 'pass', [`measure-${itemIds[1]}`]: '16.01' });

function counts(serial: string) {
	const u = shop.db.select().from(unit).where(eq(unit.serial, serial)).get()!;
	return {
		state: u.state,
		events: shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all().length,
		inspections: shop.db.select().from(inspection).where(eq(inspection.unitId, u.id)).all().length,
		photos: shop.db.select().from(unitPhoto).where(eq(unitPhoto.unitId, u.id)).all().length
	};
}

describe('GET /api/stations/{code}/board', () => {
	test('waiting, in work here and done today, with counts and overdue against the station threshold', async () => {
		const [a, b] = shop.receive(2);
		expect((await scan(a, 'TEARDOWN-1')).status).toBe(201);
		const res = await call(r.board, { params: { code: 'TEARDOWN-1' } });
		expect(res.status).toBe(200);
		const board = await res.json();
		expect(board.inWork.items.map((u: { serial: string }) => u.serial)).toContain(a);
		expect(board.waiting.items.map((u: { serial: string }) => u.serial)).toContain(b);
		expect(board.waiting.items.map((u: { serial: string }) => u.serial)).not.toContain(a);
		expect(board.done.items[0]).toMatchObject({ serial: a, action: 'inspect', done: 'Torn down', by: 'Test tech' });
		expect(board.waiting.total + board.inWork.total).toBe(shop.db.select().from(unit).all().filter((u) => u.state === 'received' || u.state === 'inspected').length);
		// Teardown 1 marks units overdue after 48 h in their stage
		const later = stationBoard(shop.db, 'TEARDOWN-1', new Date(Date.now() + 49 * 3_600_000))!;
		expect(later.waiting.items.find((u) => u.serial === b)?.overdue).toBe(true);
		expect(board.waiting.items.find((u: { serial: string }) => u.serial === b).overdue).toBe(false);
		expect((await call(r.board, { params: { code: 'NOPE' } })).status).toBe(404);
	});

	test('an unchanged board answers 304 to its ETag; any write, here or from another connection, changes it', async () => {
		const get = (tag?: string) =>
			call(r.board, { params: { code: 'WASH' }, request: new Request('http://localhost/api/stations/WASH/board', { headers: tag ? { 'if-none-match': tag } : {} }) });
		const first = await get();
		expect(first.status).toBe(200);
		expect(first.headers.get('cache-control')).toBe('private, no-cache');
		const tag = first.headers.get('etag')!;
		expect(tag).toMatch(/^W\/".+\.WASH"$/);
		const again = await get(tag);
		expect(again.status).toBe(304);
		expect(await again.text()).toBe('');
		// a move through the app's own connection
		const [u] = shop.receive(1);
		expect((await get(tag)).status).toBe(200); // the intake came from the test's connection
		const tag2 = (await get()).headers.get('etag')!;
		expect((await scan(u, 'TEARDOWN-1')).status).toBe(201);
		const after = await get(tag2);
		expect(after.status).toBe(200);
		expect(after.headers.get('etag')).not.toBe(tag2);
		// another station's tag never matches this one
		expect((await call(r.board, { params: { code: 'PAINT' }, request: new Request('http://localhost/x', { headers: { 'if-none-match': tag2 } }) })).status).toBe(200);
	});
});

describe('one scan makes the station main move', () => {
	test('a scan at Wash cleans an accepted unit; a scan at the wrong station is refused with the sentence', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		expect((await qualify(s, { verdict: 'accept', ...allPass() })).status).toBe(201);
		const ok = await scan(s, 'WASH');
		expect(ok).toMatchObject({ status: 201, body: { unit: { state: 'cleaned' } } });
		const wrong = await scan(s, 'PACK');
		expect(wrong.status).toBe(409);
		expect(wrong.body.error.message).toBe(`${s} is cleaned; packing needs it machined, painted, assembled and balanced first.`);
	});
});

describe('undo', () => {
	test('the maker undoes their own last move: a compensating event, the unit back, the history still replays', async () => {
		const [s] = shop.receive();
		const first = await scan(s, 'TEARDOWN-1');
		const res = await call(r.undo, { params: { serial: s }, request: json('http://localhost/x', { seq: first.body.event.seq, stationCode: 'TEARDOWN-1', idempotencyKey: key() }), locals: locals('tech') });
		expect(res.status).toBe(201);
		const body = await res.json();
		expect(body).toMatchObject({ ok: true, undoneSeq: 2, undoneAction: 'inspect', unit: { state: 'received', version: 3 } });
		const u = shop.db.select().from(unit).where(eq(unit.serial, s)).get()!;
		const events = shop.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).orderBy(unitEvent.seq).all();
		expect(events.map((e) => e.action)).toEqual(['receive', 'inspect', 'undo']);
		expect(replay(s, events)).toEqual({ state: u.state, held: u.held, holdReason: u.holdReason });
		// again: the last move is now the undo
		const again = await call(r.undo, { params: { serial: s }, request: json('http://localhost/x', { idempotencyKey: key() }), locals: locals('tech') });
		expect(again.status).toBe(409);
		expect((await again.json()).error.message).toBe(`The last move on ${s} is already undone.`);
	});

	test('checked on the server: another user, and too late', async () => {
		const [s] = shop.receive();
		const t = new Date();
		applyMove(shop.db, shop.actors.tech, { serial: s, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key() }, t);
		const other = await call(r.undo, { params: { serial: s }, request: json('http://localhost/x', { idempotencyKey: key() }), locals: locals('lead') });
		expect(other.status).toBe(409);
		expect((await other.json()).error.message).toContain('Only the person who made the last move');
		const late = undoLastMove(shop.db, shop.actors.tech, { serial: s, idempotencyKey: key() }, new Date(t.getTime() + 2 * 60_000 + 1));
		expect(late).toMatchObject({ ok: false, status: 409 });
		expect(counts(s)).toMatchObject({ state: 'inspected', events: 2 });
	});
});

describe('POST /api/units/{serial}/inspection — the qualification and its photos', () => {
	test('missing verdict, scrap without reason, unanswered items: a clear message and nothing saved', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		const before = counts(s);
		const a = await qualify(s, allPass(), [{ name: 'a.png', bytes: png() }]);
		expect(a).toMatchObject({ status: 400, body: { error: { message: 'Choose a verdict: accept or scrap.' } } });
		const b = await qualify(s, { verdict: 'scrap', ...allPass() });
		expect(b).toMatchObject({ status: 400, body: { error: { message: 'Choose a scrap reason.' } } });
		const c = await qualify(s, { verdict: 'accept', [`result-${itemIds[0]}`]: 'pass' }, [{ name: 'a.png', bytes: png() }]);
		expect(c).toMatchObject({ status: 400, body: { error: { message: 'Answer every item: Bearing bore is not answered.' } } });
		expect(counts(s)).toEqual(before);
	});

	test('accept without a record through the plain move API is refused by the guard', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		const res = applyMove(shop.db, shop.actors.tech, { serial: s, action: 'accept', stationCode: 'TEARDOWN-1', idempotencyKey: key() });
		expect(res).toMatchObject({ ok: false, status: 409, message: `${s}: fill in the teardown checklist before accepting it.` });
	});

	test('a file too large, and a text file named .jpg, are refused; nothing half-saved', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		const before = counts(s);
		const big = new Uint8Array(8 * 1024 * 1024 + 1);
		big.set(png().subarray(0, 8));
		const tooBig = await qualify(s, { verdict: 'accept', ...allPass() }, [{ name: 'ok.png', bytes: png() }, { name: 'huge.png', bytes: big, type: 'image/png' }]);
		expect(tooBig.status).toBe(400);
		expect(tooBig.body.error.message).toBe('huge.png is 8.0 MB; photos may be at most 8.0 MB.');
		const text = await qualify(s, { verdict: 'accept', ...allPass() }, [{ name: 'wheel.jpg', bytes: new TextEncoder().encode('not a picture at all'), type: 'image/jpeg' }]);
		expect(text.status).toBe(400);
		expect(text.body.error.message).toBe('wheel.jpg is not a JPEG, PNG or WebP image.');
		expect(counts(s)).toEqual(before);
	});

	test('a PNG named .exe is fine: stored by its hash with a thumbnail, recorded with the verdict in one go, served safely', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		const bytes = png(40, 30);
		const sha = createHash('sha256').update(bytes).digest('hex');
		const ok = await qualify(s, { verdict: 'accept', note: 'Clean core', ...allPass() }, [{ name: 'camera.exe', bytes }]);
		expect(ok).toMatchObject({ status: 201, body: { unit: { state: 'accepted' }, photos: 1 } });
		expect(counts(s)).toMatchObject({ state: 'accepted', inspections: 1, photos: 1 });
		const rec = shop.db.select().from(inspection).where(eq(inspection.unitId, shop.db.select().from(unit).where(eq(unit.serial, s)).get()!.id)).get()!;
		expect(rec).toMatchObject({ verdict: 'accept', note: 'Clean core', eventSeq: 3 });
		const answers = shop.db.select().from(inspectionAnswer).where(eq(inspectionAnswer.inspectionId, rec.id)).all();
		expect(answers.map((a) => [a.label, a.result, a.measurement])).toEqual([
			['Turbine housing cracks', 'pass', null],
			['Bearing bore', 'pass', 16.01]
		]);
		expect(existsSync(join(uploads, sha.slice(0, 2), sha))).toBe(true);
		const res = await call(r.photo, { params: { sha }, url: new URL(`http://localhost/api/photos/${sha}`) });
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('image/png');
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
		expect(Buffer.from(await res.arrayBuffer()).equals(bytes)).toBe(true);
		const thumb = await call(r.photo, { params: { sha }, url: new URL(`http://localhost/api/photos/${sha}?size=thumb`) });
		expect(thumb.headers.get('content-type')).toBe('image/jpeg');
		expect((await sharp(Buffer.from(await thumb.arrayBuffer())).metadata()).format).toBe('jpeg');
		// a hash nobody recorded is not served, even if a file of that name were there
		const unknown = await call(r.photo, { params: { sha: 'a'.repeat(64) }, url: new URL('http://localhost/x') });
		expect(unknown.status).toBe(404);
	});

	test('scrap with a reason records the inspection and scraps the unit', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		const res = await qualify(s, { verdict: 'scrap', reasonCode: 'BORE', [`result-${itemIds[0]}`]: 'pass', [`result-${itemIds[1]}`]: 'fail', [`measure-${itemIds[1]}`]: '16.2' });
		expect(res).toMatchObject({ status: 201, body: { unit: { state: 'scrapped' }, event: { action: 'scrap', data: { reasonCode: 'BORE' } } } });
		expect(counts(s)).toMatchObject({ inspections: 1 });
		// an unknown reason is refused by the scrap guard, and the inspection rolls back with the move
		const [t] = shop.receive();
		await scan(t, 'TEARDOWN-1');
		const bad = await qualify(t, { verdict: 'scrap', reasonCode: 'NOT-A-REASON', ...allPass() }, [{ name: 'x.png', bytes: png(5, 5) }]);
		expect(bad.status).toBe(409);
		expect(counts(t)).toMatchObject({ state: 'inspected', inspections: 0, photos: 0 });
	});

	test('teardown minutes go with the verdict move, where the scrap cost counts them; bad minutes are refused', async () => {
		const [s] = shop.receive();
		await scan(s, 'TEARDOWN-1');
		const tooLong = await qualify(s, { verdict: 'scrap', reasonCode: 'BORE', labourMinutes: '900', ...allPass() });
		expect(tooLong.status).toBe(400);
		expect(tooLong.body.error.fields.labourMinutes[0]).toContain('whole number from 0 to 600');
		expect(counts(s)).toMatchObject({ state: 'inspected', inspections: 0 });
		const before = shop.db.$client.prepare(`select sum(scrap_labour_minutes) from lot_tally where lot_id = ?`).pluck().get(shop.lotId) as number | null;
		const res = await qualify(s, { verdict: 'scrap', reasonCode: 'BORE', labourMinutes: '35', ...allPass() });
		expect(res).toMatchObject({ status: 201, body: { event: { action: 'scrap', data: { reasonCode: 'BORE', labourMinutes: 35 } } } });
		const after = shop.db.$client.prepare(`select sum(scrap_labour_minutes) from lot_tally where lot_id = ?`).pluck().get(shop.lotId) as number;
		expect(after - (before ?? 0)).toBe(35);
	});
});

describe('GET /api/stream', () => {
	test('a subscriber receives the unit event of a move made after it subscribed', async () => {
		const [s] = shop.receive();
		const abort = new AbortController();
		const res = await call(r.stream, { request: new Request('http://localhost/api/stream', { signal: abort.signal }) });
		expect(res.headers.get('content-type')).toContain('text/event-stream');
		const reader = res.body!.getReader();
		const decoder = new TextDecoder();
		let text = '';
		const first = await reader.read();
		text += decoder.decode(first.value);
		expect(text).toContain(': connected');
		const started = performance.now();
		applyMove(shop.db, shop.actors.tech, { serial: s, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: key() });
		while (!text.includes(`"serial":"${s}"`)) {
			const chunk = await reader.read();
			if (chunk.done) break;
			text += decoder.decode(chunk.value);
		}
		const elapsed = performance.now() - started;
		const block = text.split('\n\n').find((b) => b.includes(`"serial":"${s}"`))!;
		expect(block).toMatch(/^event: unit$/m);
		expect(JSON.parse(block.split('\n').find((l) => l.startsWith('data: '))!.slice(6))).toMatchObject({ topic: 'unit', kind: 'inspect', serial: s, state: 'inspected', stationCode: 'TEARDOWN-1' });
		expect(elapsed).toBeLessThan(1000);
		abort.abort();
		await reader.cancel().catch(() => {});
	});
});

test('uploaded files are named by hash only', () => {
	const names = readdirSync(uploads, { recursive: true }).map(String);
	expect(names.length).toBeGreaterThan(0);
	for (const name of names) expect(name).toMatch(/^[0-9a-f]{2}(\/[0-9a-f]{64}(\.thumb\.jpg)?)?$/);
});
