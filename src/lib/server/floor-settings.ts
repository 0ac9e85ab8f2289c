/**
 * The owner's floor settings: each station's overdue threshold, which techs call which
 * stations home, and the shop's scrap reasons (add, rename, deactivate — never delete, since
 * history points at their codes).
 */
import { and, asc, eq, inArray } from 'drizzle-orm';
import type { Db, DbOrTx } from './db';
import { scrapReason, station, user, userStation } from './db/schema';

type Result = { ok: true } | { ok: false; message: string };

export function setOverdueHours(db: Db, code: string, hours: number): Result {
	if (!Number.isFinite(hours) || hours <= 0 || hours > 24 * 60) return { ok: false, message: 'The overdue threshold must be between 0 and 1440 hours.' };
	const r = db.update(station).set({ overdueHours: hours }).where(eq(station.code, code)).run();
	return r.changes === 1 ? { ok: true } : { ok: false, message: `No station ${code}.` };
}

/** Station codes a person calls home, in the floor's order. */
export function stationsOf(db: DbOrTx, userId: string): string[] {
	return db
		.select({ code: station.code })
		.from(userStation)
		.innerJoin(station, eq(station.id, userStation.stationId))
		.where(and(eq(userStation.userId, userId), eq(station.active, true)))
		.orderBy(asc(station.sortOrder), asc(station.id))
		.all()
		.map((r) => r.code);
}

/** Replace a person's home stations with `codes` (one transaction). */
export function assignStations(db: Db, userId: string, codes: readonly string[]): Result {
	const person = db.select().from(user).where(eq(user.id, userId)).get();
	if (!person) return { ok: false, message: 'No such person.' };
	const ids = codes.length ? db.select({ id: station.id, code: station.code }).from(station).where(inArray(station.code, [...codes])).all() : [];
	if (ids.length !== new Set(codes).size) return { ok: false, message: 'One of those stations does not exist.' };
	db.transaction(
		(tx) => {
			tx.delete(userStation).where(eq(userStation.userId, userId)).run();
			for (const s of ids) tx.insert(userStation).values({ userId, stationId: s.id }).run();
		},
		{ behavior: 'immediate' }
	);
	return { ok: true };
}

export function assignmentTable(db: DbOrTx) {
	const people = db.select({ id: user.id, name: user.name, role: user.role }).from(user).where(eq(user.active, true)).orderBy(asc(user.name)).all();
	return people.map((p) => ({ ...p, stations: stationsOf(db, p.id) }));
}

export function allScrapReasons(db: DbOrTx) {
	return db.select().from(scrapReason).orderBy(asc(scrapReason.category), asc(scrapReason.label)).all();
}

const CODE = /^[A-Z0-9][A-Z0-9-]{1,39}$/;

export function addScrapReason(db: Db, input: { code: string; label: string; category: string }): Result {
	const code = input.code.trim().toUpperCase();
	const label = input.label.trim();
	const category = input.category.trim() || 'other';
	if (!CODE.test(code)) return { ok: false, message: 'A reason code is 2 to 40 letters, digits or dashes, e.g. TH-CRACK.' };
	if (label.length < 3 || label.length > 120) return { ok: false, message: 'Describe the reason in 3 to 120 characters.' };
	if (db.select().from(scrapReason).where(eq(scrapReason.code, code)).get()) return { ok: false, message: `The code ${code} is already used.` };
	db.insert(scrapReason).values({ code, label, category: category.slice(0, 40) }).run();
	return { ok: true };
}

export function renameScrapReason(db: Db, code: string, label: string): Result {
	const l = label.trim();
	if (l.length < 3 || l.length > 120) return { ok: false, message: 'Describe the reason in 3 to 120 characters.' };
	const r = db.update(scrapReason).set({ label: l }).where(eq(scrapReason.code, code)).run();
	return r.changes === 1 ? { ok: true } : { ok: false, message: `No scrap reason ${code}.` };
}

export function setScrapReasonActive(db: Db, code: string, active: boolean): Result {
	const r = db.update(scrapReason).set({ active }).where(eq(scrapReason.code, code)).run();
	return r.changes === 1 ? { ok: true } : { ok: false, message: `No scrap reason ${code}.` };
}
