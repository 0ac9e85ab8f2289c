/**
 * Rounds of racing moves on a few units, and the accounting of every outcome.
 *
 * Before a round the planner reads each unit (row, history, the facts its guards need) and gives
 * every racer one job on one of the units: mostly a move the machine allows from where the unit
 * is (forward moves, holds, releases, rework, scrap, undo by its maker), now and then one it
 * refuses; most jobs carry the version they were planned at (`expectedVersion`, or the `seq` of
 * the move an undo means). The racers (threads or server processes) make them at once. Afterwards
 * `roundProblems` accounts for every job against the history the database kept: one event per
 * win, consecutive seqs, each win allowed by the machine where it landed, at most one win among
 * the jobs that carried the version they saw (and it lands first), every loser's answer a
 * `version_conflict` or the machine's refusal that fits where the unit was, nothing thrown.
 */
import { and, asc, eq, gt } from 'drizzle-orm';
import type { Db } from '../../src/lib/server/db/index';
import { unit, unitEvent } from '../../src/lib/server/db/schema';
import type { Actor } from '../../src/lib/server/units';
import { loadFacts } from '../../src/lib/server/unit-facts';
import { hasAcceptedAssembly, hasPassingBalance, recordAssembly, recordBalanceRun } from '../../src/lib/server/balance';
import { ACTIONS, type ActionName } from '../../src/lib/domain/units/actions';
import { decide, replay } from '../../src/lib/domain/units/machine';
import { decideUndo, type UndoHistoryEntry } from '../../src/lib/domain/units/undo';
import type { UnitFacts } from '../../src/lib/domain/units/guards';
import { isTerminal, type Stage, type UnitState } from '../../src/lib/domain/units/states';
import type { Role } from '../../src/lib/domain/auth/roles';
import { asksFor, pickWeighted, sortAsks, type MoveAsk } from './machine-moves';
import { GOOD_ASSEMBLY, GOOD_RUN } from './build-records';

export interface RaceJob {
	key: string;
	serial: string;
	kind: 'move' | 'undo';
	actor: Actor;
	/** Who the actor is, for messages. */
	who: string;
	action: ActionName | 'undo';
	stationStage: Stage | null;
	stationCode: string | null;
	data: Record<string, unknown>;
	/** A move: the version it was planned at, when it carries it. */
	expectedVersion?: number;
	/** An undo: the seq of the move it means, when it names it. */
	undoSeq?: number;
	/** What the machine said about this job on the unit as it was before the round. */
	allowedAtStart: boolean;
}

export type RaceOutcome =
	| { key: string; ok: true; status: number; version: number; state: string; ms: number }
	| { key: string; ok: false; status: number; code: string; message: string; ms: number }
	| { key: string; threw: string; ms: number };

export interface RacePeople {
	techs: Actor[];
	lead: Actor;
	owner: Actor;
	office: Actor;
	/** Names for messages, by actor id. */
	names: Map<string, string>;
}

export interface Snapshot {
	serial: string;
	state: UnitState;
	held: boolean;
	holdReason: string | null;
	version: number;
	history: (UndoHistoryEntry & { idempotencyKey: string })[];
	facts: UnitFacts;
}

/** The unit as a racer will find it: row, history and every fact the guards of any move read. */
export function snapshot(db: Db, serial: string): Snapshot {
	const row = db.select().from(unit).where(eq(unit.serial, serial)).get();
	if (!row) throw new Error(`no unit ${serial}`);
	const events = db.select().from(unitEvent).where(eq(unitEvent.unitId, row.id)).orderBy(asc(unitEvent.seq)).all();
	const facts: UnitFacts = {};
	for (const action of ACTIONS) Object.assign(facts, loadFacts(db, row, action));
	return {
		serial,
		state: row.state,
		held: row.held,
		holdReason: row.holdReason,
		version: row.version,
		history: events.map((e) => ({ ...e, userId: e.userId })),
		facts
	};
}

function actorFor(role: Role, people: RacePeople, random: () => number): Actor {
	if (role === 'tech') return people.techs[Math.floor(random() * people.techs.length)];
	return people[role];
}

function stationFor(stage: Stage | null, stations: Record<Stage, string[]>, random: () => number): string | null {
	if (!stage) return null;
	const codes = stations[stage];
	return codes[Math.floor(random() * codes.length)];
}

type Option = { kind: 'move'; ask: MoveAsk } | { kind: 'undo'; actor: Actor };

/**
 * The jobs of one round: `racers` jobs spread over the units of `pool`, often all on one unit.
 * `roles`: who makes moves (through the API only the floor roles reach the move route).
 */
export function planRound(
	db: Db,
	round: number,
	pool: readonly string[],
	racers: number,
	people: RacePeople,
	stations: Record<Stage, string[]>,
	random: () => number,
	roles: readonly Role[] = ['tech', 'lead', 'owner', 'office']
): { jobs: RaceJob[]; snapshots: Map<string, Snapshot> } {
	const snapshots = new Map<string, Snapshot>();
	const together = random() < 0.5;
	// undo is floor work: the office may not reach it (403), so it is not asked
	const floor = [...people.techs, people.lead, people.owner];
	const jobs: RaceJob[] = [];
	for (let r = 0; r < racers; r++) {
		const serial = together ? pool[round % pool.length] : pool[Math.floor(random() * pool.length)];
		let snap = snapshots.get(serial);
		if (!snap) snapshots.set(serial, (snap = snapshot(db, serial)));
		const sorted = sortAsks(snap, snap.facts, asksFor(snap.state).filter((a) => roles.includes(a.role)));
		const now = new Date();
		const undoOk: Option[] = [];
		const undoNo: Option[] = [];
		for (const actor of floor) (decideUndo(serial, snap.history, { userId: actor.id }, now).ok ? undoOk : undoNo).push({ kind: 'undo', actor });
		const allowed: Option[] = [...sorted.allowed.map((a): Option => ({ kind: 'move', ask: a.ask })), ...undoOk];
		const refused: Option[] = [...sorted.refused.map((a): Option => ({ kind: 'move', ask: a.ask })), ...undoNo];
		const wantAllowed = allowed.length > 0 && random() < 0.8;
		const option = wantAllowed
			? pickWeighted(allowed, (o) => (o.kind === 'undo' ? 'undo' : o.ask.action), random())
			: refused[Math.floor(random() * refused.length)];
		const key = `race-${round}-${r}-${serial}-${Math.floor(random() * 1e9).toString(36)}`;
		const versioned = random() < 0.6;
		if (option.kind === 'undo') {
			const last = snap.history[snap.history.length - 1];
			jobs.push({
				key,
				serial,
				kind: 'undo',
				actor: option.actor,
				who: people.names.get(option.actor.id) ?? option.actor.role,
				action: 'undo',
				stationStage: null,
				stationCode: null,
				data: {},
				...(versioned ? { undoSeq: last.seq } : {}),
				allowedAtStart: wantAllowed
			});
		} else {
			const actor = actorFor(option.ask.role, people, random);
			jobs.push({
				key,
				serial,
				kind: 'move',
				actor,
				who: people.names.get(actor.id) ?? actor.role,
				action: option.ask.action,
				stationStage: option.ask.stationStage,
				stationCode: stationFor(option.ask.stationStage, stations, random),
				data: option.ask.data,
				...(versioned ? { expectedVersion: snap.version } : {}),
				allowedAtStart: wantAllowed
			});
		}
	}
	return { jobs, snapshots };
}

function describeJob(j: RaceJob): string {
	const version = j.expectedVersion !== undefined ? ` expecting v${j.expectedVersion}` : j.undoSeq !== undefined ? ` of seq ${j.undoSeq}` : '';
	const data = Object.keys(j.data).length ? ` ${JSON.stringify(j.data)}` : '';
	return `${j.key} (${j.action}${data} by ${j.who} at ${j.stationCode ?? 'no station'}${version}, ${j.allowedAtStart ? 'allowed' : 'refused'} at the start)`;
}

export interface RaceTally {
	rounds: number;
	jobs: number;
	wins: number;
	/** Wins of jobs that carried the version they saw. */
	versionedWins: number;
	versionConflicts: number;
	/** Refused because another racer moved the unit first (the job was allowed when planned). */
	refusedAfterAnotherWon: number;
	/** Refused as planned (the machine refuses it on the unit as it was). */
	refusedAsPlanned: number;
	/** Jobs that shared their unit with at least one other job of the round. */
	contended: number;
	/** Jobs that took longer than `waitedMs`: they waited for another racer's transaction. */
	waited: number;
	undos: number;
	finished: Record<'shipped' | 'scrapped', number>;
}

export function emptyTally(): RaceTally {
	return {
		rounds: 0,
		jobs: 0,
		wins: 0,
		versionedWins: 0,
		versionConflicts: 0,
		refusedAfterAnotherWon: 0,
		refusedAsPlanned: 0,
		contended: 0,
		waited: 0,
		undos: 0,
		finished: { shipped: 0, scrapped: 0 }
	};
}

/**
 * Everything wrong with one round, as sentences (empty when every outcome is accounted for).
 * `waitedMs`: a job slower than this is counted as having waited for another racer's transaction.
 */
export function roundProblems(db: Db, snapshots: Map<string, Snapshot>, jobs: readonly RaceJob[], outcomes: readonly RaceOutcome[], tally: RaceTally, waitedMs: number): string[] {
	const problems: string[] = [];
	const outcomeOf = new Map(outcomes.map((o) => [o.key, o]));
	tally.rounds++;
	for (const [serial, snap] of snapshots) {
		const mine = jobs.filter((j) => j.serial === serial);
		const row = db.select().from(unit).where(eq(unit.serial, serial)).get()!;
		const events = db
			.select()
			.from(unitEvent)
			.where(and(eq(unitEvent.unitId, row.id), gt(unitEvent.seq, snap.version)))
			.orderBy(asc(unitEvent.seq))
			.all();
		const v0 = snap.version;
		const k = events.length;
		const jobOf = new Map(mine.map((j) => [j.key, j]));
		const eventOf = new Map(events.map((e) => [e.idempotencyKey, e]));

		// every answer is a win, a version conflict or the machine's refusal; nothing thrown, nothing else
		for (const j of mine) {
			const o = outcomeOf.get(j.key);
			tally.jobs++;
			if (mine.length > 1) tally.contended++;
			if (!o) {
				problems.push(`${describeJob(j)}: no answer`);
				continue;
			}
			if (o.ms > waitedMs) tally.waited++;
			if ('threw' in o) problems.push(`${describeJob(j)} threw: ${o.threw}`);
			else if (o.ok) {
				tally.wins++;
				if (j.kind === 'undo') tally.undos++;
				if (o.status !== 201) problems.push(`${describeJob(j)}: won with ${o.status}, not 201`);
				const e = eventOf.get(j.key);
				if (!e) problems.push(`${describeJob(j)}: answered ${o.status} but no history entry carries its key`);
				else if (o.version !== e.seq) problems.push(`${describeJob(j)}: answered version ${o.version}, its entry is seq ${e.seq}`);
			} else if (o.code === 'version_conflict') {
				tally.versionConflicts++;
				if (j.expectedVersion === undefined) problems.push(`${describeJob(j)}: version_conflict though it sent no version`);
				if (k === 0) problems.push(`${describeJob(j)}: version_conflict though nobody moved ${serial} (still v${v0})`);
				if (o.status !== 409) problems.push(`${describeJob(j)}: version_conflict with ${o.status}`);
			} else if (o.code === 'refused') {
				if (o.status !== 409) problems.push(`${describeJob(j)}: refused with ${o.status}`);
				if (j.allowedAtStart) {
					tally.refusedAfterAnotherWon++;
					// allowed where the unit was: refused only because another racer moved it first
					if (k === 0) problems.push(`${describeJob(j)}: refused though nobody moved ${serial}: ${o.message}`);
					if (j.expectedVersion !== undefined) problems.push(`${describeJob(j)}: carried v${v0}, was allowed there, so it must win or meet version_conflict; got refused: ${o.message}`);
					if (j.undoSeq !== undefined && !/moved since/.test(o.message)) problems.push(`${describeJob(j)}: its move was undoable; refused for another reason: ${o.message}`);
				} else tally.refusedAsPlanned++;
			} else problems.push(`${describeJob(j)}: ${o.status} ${o.code}: ${o.message}`);
		}

		// one history entry per win, in consecutive seqs after the version the round started at
		const winners = mine.filter((j) => {
			const o = outcomeOf.get(j.key);
			return o !== undefined && 'ok' in o && o.ok;
		});
		events.forEach((e, i) => {
			if (e.seq !== v0 + 1 + i) problems.push(`${serial}: entry ${i + 1} of the round has seq ${e.seq}, expected ${v0 + 1 + i}`);
			if (!jobOf.has(e.idempotencyKey)) problems.push(`${serial}: entry seq ${e.seq} (${e.action}) belongs to no job of the round`);
		});
		if (winners.length !== k) problems.push(`${serial}: ${winners.length} wins answered, ${k} entries written`);
		if (mine.some((j) => j.allowedAtStart) && k === 0) problems.push(`${serial}: no job won though some were allowed from ${snap.state}`);

		// one winner per version: a job that carried the version it saw wins only as the first move of the round
		for (const j of winners) {
			const e = eventOf.get(j.key);
			const carried = j.expectedVersion !== undefined || j.undoSeq !== undefined;
			if (carried && e && e.seq !== v0 + 1) problems.push(`${describeJob(j)}: carried v${v0} but was written as seq ${e.seq}, after another win`);
			if (carried && !j.allowedAtStart) problems.push(`${describeJob(j)}: carried v${v0}, where the machine refuses it, and won`);
			if (carried) tally.versionedWins++;
		}
		const carriedWins = winners.filter((j) => j.expectedVersion !== undefined || j.undoSeq !== undefined).length;
		if (carriedWins > 1) problems.push(`${serial}: ${carriedWins} jobs that carried v${v0} all won`);

		// each win was allowed where it landed, and the row is the fold of the history
		let at = { serial, state: snap.state, held: snap.held, holdReason: snap.holdReason };
		const history = [...snap.history];
		for (const e of events) {
			const j = jobOf.get(e.idempotencyKey);
			if (!j) break;
			if (e.fromState !== at.state) problems.push(`${describeJob(j)}: entry starts at ${e.fromState}, the unit was ${at.state}`);
			if (j.kind === 'move') {
				const d = decide(at, { action: j.action as ActionName, role: j.actor.role, stationStage: j.stationStage, data: j.data }, snap.facts);
				if (!d.ok) problems.push(`${describeJob(j)}: won at ${at.state}${at.held ? ' (held)' : ''}, where the machine refuses it: ${d.message}`);
				else if (d.to !== e.toState) problems.push(`${describeJob(j)}: went to ${e.toState}, the machine says ${d.to}`);
				if (e.action !== j.action) problems.push(`${describeJob(j)}: written as ${e.action}`);
			} else {
				const d = decideUndo(serial, history, { userId: j.actor.id, seq: j.undoSeq }, e.at);
				if (!d.ok) problems.push(`${describeJob(j)}: undo won where it is refused: ${d.message}`);
				else if (d.to !== e.toState) problems.push(`${describeJob(j)}: undo went to ${e.toState}, expected ${d.to}`);
				if (e.action !== 'undo') problems.push(`${describeJob(j)}: written as ${e.action}`);
			}
			history.push({ ...e });
			const folded = replay(serial, history);
			at = { serial, ...folded };
		}
		if (row.version !== v0 + k) problems.push(`${serial}: row at v${row.version} after ${k} entries from v${v0}`);
		if (row.state !== at.state || row.held !== at.held) problems.push(`${serial}: row ${row.state}${row.held ? ' held' : ''}, fold of the history ${at.state}${at.held ? ' held' : ''}`);
	}
	return problems;
}

/**
 * Between rounds: record what the next moves' guards look for (an assembly record on a painted
 * unit, a passing balance run on an assembled one), and swap units that reached an end state
 * for fresh ones so the race keeps moving.
 */
export function tidyPool(db: Db, pool: string[], people: RacePeople, tally: RaceTally, receive: () => string): void {
	for (let i = 0; i < pool.length; i++) {
		const row = db.select().from(unit).where(eq(unit.serial, pool[i])).get()!;
		if (isTerminal(row.state)) {
			tally.finished[row.state as 'shipped' | 'scrapped']++;
			pool[i] = receive();
			continue;
		}
		if (row.held) continue;
		if (row.state === 'painted' && !hasAcceptedAssembly(db, row.id)) {
			const r = recordAssembly(db, people.lead, row.serial, GOOD_ASSEMBLY);
			if (!r.ok) throw new Error(`assembly record for ${row.serial}: ${r.message}`);
		}
		if (row.state === 'assembled' && !hasPassingBalance(db, row.id)) {
			const r = recordBalanceRun(db, people.lead, row.serial, GOOD_RUN);
			if (!r.ok) throw new Error(`balance run for ${row.serial}: ${r.message}`);
		}
	}
}

/** A barrier for threads: each calls `arrive`; all return once the last has arrived. */
export function arriveAt(barrier: Int32Array, parties: number, timeoutMs = 30_000): void {
	const generation = Atomics.load(barrier, 1);
	if (Atomics.add(barrier, 0, 1) === parties - 1) {
		Atomics.store(barrier, 0, 0);
		Atomics.add(barrier, 1, 1);
		Atomics.notify(barrier, 1);
		return;
	}
	const deadline = Date.now() + timeoutMs;
	while (Atomics.load(barrier, 1) === generation) {
		if (Atomics.wait(barrier, 1, generation, Math.max(1, deadline - Date.now())) === 'timed-out' && Date.now() >= deadline) {
			throw new Error('barrier: the other racers did not arrive');
		}
	}
}
