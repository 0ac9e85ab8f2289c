/**
 * Put units into a demo database before a server opens it, through the real services, and
 * read a database's histories back for checks.
 */
import { asc, eq } from 'drizzle-orm';
import { openDatabase, type Db } from '../../src/lib/server/db/index';
import { coreLot, turboModel, unit, unitEvent, user } from '../../src/lib/server/db/schema';
import { applyMove, receiveUnits, type Actor } from '../../src/lib/server/units';
import { replay } from '../../src/lib/domain/units/machine';
import type { ActionName } from '../../src/lib/domain/units/actions';
import { DEMO_PEOPLE } from './server';

function actor(db: Db, email: string): Actor {
	const u = db.select().from(user).where(eq(user.email, email)).get()!;
	return { id: u.id, role: u.role };
}

/** Receive `count` units, then walk each through the given moves; returns their serials. */
export function prepareUnits(file: string, count: number, moves: [ActionName, string][] = []): string[] {
	const db = openDatabase(file);
	try {
		const office = actor(db, DEMO_PEOPLE.office.email);
		const lead = actor(db, DEMO_PEOPLE.lead.email);
		const lotId = db.select().from(coreLot).orderBy(asc(coreLot.id)).get()!.id;
		const modelId = db.select().from(turboModel).orderBy(asc(turboModel.id)).get()!.id;
		const serials: string[] = [];
		for (let done = 0; done < count; done += 500) {
			const n = Math.min(500, count - done);
			serials.push(...receiveUnits(db, office, lotId, Array.from({ length: n }, () => ({ modelId }))));
		}
		for (const serial of serials) {
			for (const [action, stationCode] of moves) {
				const r = applyMove(db, lead, { serial, action, stationCode, idempotencyKey: `prep-${serial}-${action}` });
				if (!r.ok) throw new Error(`prepare ${serial} ${action}: ${r.message}`);
			}
		}
		return serials;
	} finally {
		db.$client.close();
	}
}

export interface UnitCheck {
	serial: string;
	state: string;
	held: boolean;
	version: number;
	events: { seq: number; action: string; fromState: string | null; toState: string; idempotencyKey: string; stationId: number | null }[];
	/** null when the stored row equals the fold of the history; otherwise what differs. */
	problem: string | null;
}

/** Every unit (or the named ones) with its history and whether the row equals `replay` of it. */
export function checkUnits(db: Db, serials?: readonly string[]): UnitCheck[] {
	const rows = db.select().from(unit).orderBy(asc(unit.id)).all();
	const wanted = serials ? new Set(serials) : null;
	const out: UnitCheck[] = [];
	for (const row of rows) {
		if (wanted && !wanted.has(row.serial)) continue;
		const events = db.select().from(unitEvent).where(eq(unitEvent.unitId, row.id)).orderBy(asc(unitEvent.seq)).all();
		let problem: string | null = null;
		try {
			const folded = replay(row.serial, events);
			if (folded.state !== row.state || folded.held !== row.held) problem = `row ${row.state}/${row.held}, fold ${folded.state}/${folded.held}`;
			else if (events.length !== row.version) problem = `version ${row.version} but ${events.length} events`;
			else if (events.some((e, i) => e.seq !== i + 1)) problem = `seq not 1..${events.length}`;
		} catch (e) {
			problem = (e as Error).message;
		}
		out.push({ serial: row.serial, state: row.state, held: row.held, version: row.version, events, problem });
	}
	return out;
}
