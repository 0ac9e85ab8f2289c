import { eq, sql } from 'drizzle-orm';
import { describe, expect, test } from 'vitest';
import { testShop } from '../helpers/db';
import { checkAccess } from '../../src/lib/server/access';
import { counter, coreLot, turboModel, unit, unitEvent } from '../../src/lib/server/db/schema';
import { addUnit, createLot, getLot, importManifest, isLotSortKey, listLots, lotView, lotsCsv, previewManifestFile, previewManifestText } from '../../src/lib/server/lots';
import type { Role } from '../../src/lib/domain/auth/roles';
import { createSupplier, DuplicateSupplierError, listSuppliers, updateSupplier } from '../../src/lib/server/suppliers';
import { unitRecord } from '../../src/lib/server/unit-record';
import { applyMove } from '../../src/lib/server/units';
import { seedDemo } from '../../src/lib/server/seed';
import { openDatabase } from '../../src/lib/server/db/index';

const enc = (s: string) => new TextEncoder().encode(s);
const MAP = { originalTag: '0', model: '1', notes: '2' };

function shop() {
	const s = testShop();
	s.db.insert(turboModel).values({ code: 'CH-V55', family: 'V' }).run();
	return s;
}
const unitsIn = (s: ReturnType<typeof shop>, lotId = s.lotId) => s.db.select().from(unit).where(eq(unit.lotId, lotId)).all();
const serialCounter = (s: ReturnType<typeof shop>) => s.db.select().from(counter).where(eq(counter.name, 'unit_serial')).get()?.value ?? 0;

describe('manifest import', () => {
	test('one bad row is listed with its reason and the rest import in one go', () => {
		const s = shop();
		const csv = 'Core tag,Model,Notes\r\nAX-1,CH-F46,oily\r\nAX-2,CH-Q00,\r\nAX-3,ch-v55,\r\n';
		const preview = previewManifestFile(s.db, s.lotId, enc(csv));
		expect(preview.ok).toBe(true);
		if (!preview.ok) return;
		expect(preview.map).toEqual({ originalTag: 0, model: 1, notes: 2 });
		expect(preview.check!.bad).toEqual([expect.objectContaining({ rowNumber: 3, reason: 'Unknown model "CH-Q00".' })]);
		expect(unitsIn(s)).toHaveLength(0); // a preview saves nothing

		const r = importManifest(s.db, s.actors.office, s.lotId, preview.text, MAP, 2);
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.serials).toHaveLength(2);
		expect(r.skipped.map((b) => b.rowNumber)).toEqual([3]);
		const units = unitsIn(s);
		expect(units.map((u) => [u.originalTag, u.state, u.notes])).toEqual([
			['AX-1', 'received', 'oily'],
			['AX-3', 'received', '']
		]);
		// each unit has its first history entry, made by the importer
		for (const u of units) {
			const ev = s.db.select().from(unitEvent).where(eq(unitEvent.unitId, u.id)).all();
			expect(ev).toEqual([expect.objectContaining({ seq: 1, action: 'receive', toState: 'received', userId: s.actors.office.id })]);
		}
	});

	test('duplicate tags: within the file, and already in the lot', () => {
		const s = shop();
		addUnit(s.db, s.actors.office, s.lotId, { model: 'CH-F46', originalTag: 'QT-7', notes: '' });
		const csv = 'Tag,Model,Notes\nQT-1,CH-F46,\nqt-1,CH-F46,\nQT-7,CH-F46,\nQT-2,CH-F46,\n';
		const p = previewManifestText(s.db, s.lotId, csv, MAP);
		expect(p.ok && p.check!.bad.map((b) => b.reason)).toEqual(['Duplicate tag: qt-1 is also on row 2.', expect.stringMatching(/^Tag QT-7 is already in this lot \(SY-\d{5}\)\.$/)]);
		const r = importManifest(s.db, s.actors.office, s.lotId, csv, MAP, 2);
		expect(r.ok).toBe(true);
		expect(unitsIn(s).map((u) => u.originalTag).sort()).toEqual(['QT-1', 'QT-2', 'QT-7']);
		// importing the same file again adds nothing: every row is now in the lot
		const again = importManifest(s.db, s.actors.office, s.lotId, csv, MAP, 0);
		expect(again.ok).toBe(false);
		expect(unitsIn(s)).toHaveLength(3);
	});

	test('empty, header-only, BOM and wrongly encoded files', () => {
		const s = shop();
		const cases: [Uint8Array, RegExp | null][] = [
			[new Uint8Array(), /empty/],
			[enc('Tag,Model,Notes\r\n'), /header row but no data rows/],
			[enc('\r\n\r\n'), /empty/],
			[new Uint8Array([0xff, 0xfe, ...[...'Tag,Model\r\nA,CH-F46\r\n'].flatMap((c) => [c.charCodeAt(0), 0])]), /UTF-16/],
			[new Uint8Array([...enc('Tag,Model,Notes\nAX-1,CH-F46,Caf'), 0xe9, 0x0a]), /not UTF-8/],
			[new Uint8Array([0xef, 0xbb, 0xbf, ...enc('Tag,Model,Notes\nAX-1,CH-F46,ok\n')]), null]
		];
		for (const [bytes, message] of cases) {
			const p = previewManifestFile(s.db, s.lotId, bytes);
			// a refusal names the problem; the one good file (with a byte-order mark) loses the mark:
			// its first header is "Tag", not "\uFEFFTag"
			expect(p).toMatchObject(message ? { ok: false, message: expect.stringMatching(message) } : { ok: true, headers: ['Tag', 'Model', 'Notes'] });
		}
		expect(unitsIn(s)).toHaveLength(0);
	});

	test('nothing is half-imported: a failure on one row rolls back every row and the serial counter', () => {
		const s = shop();
		s.receive(1);
		const before = serialCounter(s);
		s.db.run(sql.raw(`CREATE TEMP TRIGGER fail_on_boom BEFORE INSERT ON unit WHEN NEW.original_tag = 'BOOM' BEGIN SELECT RAISE(ABORT, 'disk trouble'); END`));
		const csv = 'Tag,Model,Notes\nA,CH-F46,\nB,CH-F46,\nBOOM,CH-F46,\nC,CH-F46,\n';
		expect(() => importManifest(s.db, s.actors.office, s.lotId, csv, MAP, 4)).toThrow(/disk trouble/);
		expect(unitsIn(s)).toHaveLength(1);
		expect(serialCounter(s)).toBe(before);
	});

	test('if the lot changed since the preview, nothing is imported and the new preview comes back', () => {
		const s = shop();
		const csv = 'Tag,Model,Notes\nA,CH-F46,\nB,CH-F46,\n';
		addUnit(s.db, s.actors.lead, s.lotId, { model: 'CH-F46', originalTag: 'B', notes: '' }); // someone was quicker
		const r = importManifest(s.db, s.actors.office, s.lotId, csv, MAP, 2);
		expect(r).toMatchObject({ ok: false, message: expect.stringContaining('changed since the preview') });
		expect(!r.ok && r.preview?.check?.good.map((g) => g.originalTag)).toEqual(['A']);
		expect(unitsIn(s)).toHaveLength(1);
	});

	test('a column map without the model is refused before any row is checked', () => {
		const s = shop();
		const p = previewManifestText(s.db, s.lotId, 'Tag,Model\nA,CH-F46\n', { originalTag: '0', model: '', notes: '' });
		expect(p.ok && p.check).toBeNull();
		expect(p.ok && p.mapErrors).toEqual({ model: 'Choose the column that holds the model.' });
		const r = importManifest(s.db, s.actors.office, s.lotId, 'Tag,Model\nA,CH-F46\n', { originalTag: '0', model: '', notes: '' }, 1);
		expect(r.ok).toBe(false);
		expect(unitsIn(s)).toHaveLength(0);
	});

	test('a tech cannot receive units, even by calling the service', () => {
		const s = shop();
		expect(() => importManifest(s.db, s.actors.tech, s.lotId, 'Tag,Model,Notes\nA,CH-F46,\n', MAP, 1)).toThrow(/cannot receive/);
		expect(unitsIn(s)).toHaveLength(0);
	});
});

describe('lots and suppliers', () => {
	test('creating a lot gives the next code; a skid needs an active supplier', () => {
		const s = shop();
		const sup = createSupplier(s.db, { name: 'Bramblegate Cores', notes: '' });
		const r = createLot(s.db, { supplierId: String(sup.id), source: 'purchased_skid', receivedOn: '2026-12-01', costPerCore: '38.50', expectedCount: 30, notes: '' }, '2026-12-01');
		expect(r).toEqual({ ok: true, code: 'L261201-01' });
		const lot = s.db.select().from(coreLot).where(eq(coreLot.code, 'L261201-01')).get()!;
		expect(lot.costPerCoreCents).toBe(3850);
		updateSupplier(s.db, sup.id, { name: sup.name, notes: '', active: false });
		const refused = createLot(s.db, { supplierId: String(sup.id), source: 'purchased_skid', receivedOn: '2026-12-01', costPerCore: '1', expectedCount: 1, notes: '' }, '2026-12-01');
		expect(refused).toMatchObject({ ok: false, field: 'supplierId' });
		expect(() => createSupplier(s.db, { name: 'bramblegate cores', notes: '' })).toThrow(DuplicateSupplierError);
	});

	test('the lot list counts each lot’s units by where they are (checked against a count by hand)', () => {
		const s = shop();
		const serials = s.receive(4);
		const k = (n: string) => `${n}-${Math.random()}`;
		const inspect = (serial: string) => applyMove(s.db, s.actors.tech, { serial, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: k('i') });
		for (const x of serials) inspect(x);
		applyMove(s.db, s.actors.tech, { serial: serials[0], action: 'accept', stationCode: 'TEARDOWN-1', idempotencyKey: k('a') });
		applyMove(s.db, s.actors.tech, { serial: serials[1], action: 'scrap', stationCode: 'TEARDOWN-1', idempotencyKey: k('s'), data: { reasonCode: 'TH-CRACK' } });
		applyMove(s.db, s.actors.lead, { serial: serials[2], action: 'hold', idempotencyKey: k('h'), data: { reason: 'Waiting for a wheel' } });
		const [l] = listLots(s.db);
		// by hand: 4 received; 1 accepted (in work), 1 scrapped, 2 still inspected (one of them held)
		expect(l).toMatchObject({ code: 'L-TEST-1', expectedCount: 10, received: 4, waiting: 2, inWork: 1, scrapped: 1, shipped: 0, held: 1 });
		const csv = lotsCsv([l], 'owner');
		expect(csv.split('\r\n')[1]).toBe('L-TEST-1,2026-11-30,Purchased skid,Test Core Source,40.00,10,4,2,1,0,1,1,');
		expect(listSuppliers(s.db).find((x) => x.name === 'Test Core Source')).toMatchObject({ lots: 1, units: 4 });
	});

	test('the lot list per role: the price per core for the office, the lead and the owner; shipped and scrapped per lot for the owner only', () => {
		const s = shop();
		const [x] = s.receive(1);
		applyMove(s.db, s.actors.tech, { serial: x, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: `i-${x}` });
		applyMove(s.db, s.actors.tech, { serial: x, action: 'scrap', stationCode: 'TEARDOWN-1', idempotencyKey: `s-${x}`, data: { reasonCode: 'TH-CRACK' } });
		const lots = listLots(s.db);
		const header = (role: Role) => lotsCsv(lots, role).slice(1).split('\r\n')[0];
		expect(header('owner')).toBe('lot,received_on,source,supplier,cost_per_core,expected,received,waiting_teardown,in_work,shipped,scrapped,on_hold,notes');
		expect(header('office')).toBe('lot,received_on,source,supplier,cost_per_core,expected,received,waiting_teardown,in_work,on_hold,notes');
		expect(header('lead')).toBe(header('office'));
		expect(header('tech')).toBe('lot,received_on,source,supplier,expected,received,waiting_teardown,in_work,on_hold,notes');
		expect(lotsCsv(lots, 'tech').split('\r\n')[1]).toBe('L-TEST-1,2026-11-30,Purchased skid,Test Core Source,10,1,0,0,0,');
		expect(lotView(lots[0], 'tech')).not.toHaveProperty('costPerCoreCents');
		expect(lotView(lots[0], 'tech')).not.toHaveProperty('scrapped');
		expect(lotView(lots[0], 'office')).toMatchObject({ costPerCoreCents: 4000 });
		expect(lotView(lots[0], 'office')).not.toHaveProperty('scrapped');
		expect(lotView(lots[0], 'owner')).toMatchObject({ costPerCoreCents: 4000, scrapped: 1, shipped: 0 });
		// sorting by a hidden count would show it by the order: refused for those who may not see it
		expect(isLotSortKey('scrapped', 'tech')).toBe(false);
		expect(isLotSortKey('shipped', 'office')).toBe(false);
		expect(isLotSortKey('scrapped', 'owner')).toBe(true);
		expect(isLotSortKey('received', 'tech')).toBe(true);
	});

	test('lots sort by any column', () => {
		const s = shop();
		createLot(s.db, { supplierId: '', source: 'customer_return', receivedOn: '2026-12-01', costPerCore: '0', expectedCount: 3, notes: '' }, '2026-12-01');
		s.receive(2);
		expect(listLots(s.db, 'received', 'desc').map((l) => l.code)).toEqual(['L-TEST-1', 'L261201-01']);
		expect(listLots(s.db, 'received', 'asc').map((l) => l.code)).toEqual(['L261201-01', 'L-TEST-1']);
		expect(listLots(s.db, 'receivedOn', 'desc')[0].code).toBe('L261201-01');
	});

	test('adding one unit checks the model and the tag', () => {
		const s = shop();
		expect(addUnit(s.db, s.actors.office, s.lotId, { model: 'CH-NOPE', originalTag: '', notes: '' })).toMatchObject({ ok: false, field: 'model' });
		const a = addUnit(s.db, s.actors.office, s.lotId, { model: 'CH-F46', originalTag: 'MR-1', notes: 'seized' });
		expect(a.ok).toBe(true);
		expect(addUnit(s.db, s.actors.office, s.lotId, { model: 'CH-F46', originalTag: ' mr-1', notes: '' })).toMatchObject({ ok: false, field: 'originalTag' });
		expect(getLot(s.db, 'L-TEST-1')!.units).toEqual([expect.objectContaining({ originalTag: 'MR-1', notes: 'seized', model: 'CH-F46', state: 'received' })]);
	});

	test('the printed history has the lot, the supplier and every event', () => {
		const s = shop();
		const [serial] = s.receive(1);
		applyMove(s.db, s.actors.tech, { serial, action: 'inspect', stationCode: 'TEARDOWN-1', idempotencyKey: 'rec-1' });
		const r = unitRecord(s.db, serial)!;
		expect(r.lot).toMatchObject({ code: 'L-TEST-1', supplier: 'Test Core Source', receivedOn: '2026-11-30' });
		expect(r.history.map((e) => [e.action, e.fromState, e.toState, e.station?.code ?? null])).toEqual([
			['receive', null, 'received', null],
			['inspect', 'received', 'inspected', 'TEARDOWN-1']
		]);
		expect(unitRecord(s.db, 'SY-99999')).toBeNull();
	});

	test('who may reach the intake pages', () => {
		expect(checkAccess('/(app)/lots/new', 'GET', 'tech')).toBe('forbidden');
		expect(checkAccess('/(app)/lots/new', 'POST', 'tech')).toBe('forbidden');
		expect(checkAccess('/(app)/lots/new', 'POST', 'office')).toBe('allow');
		expect(checkAccess('/(app)/lots/[code=code]', 'GET', 'tech')).toBe('allow');
		expect(checkAccess('/(app)/lots/[code=code]', 'POST', 'tech')).toBe('forbidden');
		expect(checkAccess('/(app)/lots/[code=code]/import', 'POST', 'lead')).toBe('allow');
		expect(checkAccess('/(app)/suppliers', 'POST', 'lead')).toBe('forbidden');
		expect(checkAccess('/(app)/suppliers', 'POST', 'office')).toBe('allow');
		expect(checkAccess('/(print)/lots/[code=code]/travelers', 'GET', 'tech')).toBe('allow');
		expect(checkAccess('/api/units/[serial=serial]/barcode', 'GET', null)).toBe('sign-in');
	});
});

test('the demo shop’s lots read well: counts add up and the newest skid still has cores to come', async () => {
	const db = openDatabase(':memory:');
	const made = await seedDemo(db, { now: new Date('2026-12-01T12:00:00Z') });
	const lots = listLots(db);
	expect(lots).toHaveLength(made.lots);
	expect(lots.reduce((n, l) => n + l.received, 0)).toBe(made.units);
	for (const l of lots) expect(l.waiting + l.inWork + l.shipped + l.scrapped).toBe(l.received);
	const newestSkid = lots.find((l) => l.source === 'purchased_skid')!;
	expect(newestSkid.expectedCount - newestSkid.received).toBe(6);
	expect(lots.filter((l) => l.source === 'purchased_skid' && l.expectedCount !== l.received).map((l) => l.code)).toEqual([newestSkid.code]);
});
