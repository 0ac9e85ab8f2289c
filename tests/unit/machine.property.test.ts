import fc from 'fast-check';
import { expect, test } from 'vitest';
import { ACTIONS, type ActionName } from '../../src/lib/domain/units/actions';
import { decide, replay, type HistoryEntry } from '../../src/lib/domain/units/machine';
import { decideUndo, type UndoHistoryEntry } from '../../src/lib/domain/units/undo';
import type { UnitFacts } from '../../src/lib/domain/units/guards';
import { STAGES, TERMINAL_STATES, UNIT_STATES, isTerminal, type Stage, type UnitState } from '../../src/lib/domain/units/states';
import { ROLES, type Role } from '../../src/lib/domain/auth/roles';
import { asksFor, everyAsk, pickWeighted, sortAsks, type MoveAsk } from '../helpers/machine-moves';

const step = fc.record({
	action: fc.constantFrom(...ACTIONS.filter((a) => a !== 'receive')),
	role: fc.constantFrom(...ROLES),
	stationStage: fc.option(fc.constantFrom(...STAGES), { nil: null }),
	data: fc.record(
		{
			reasonCode: fc.constantFrom('TH-CRACK', 'BORE', '', 'UNKNOWN'),
			reason: fc.oneof(fc.constant('waiting for a wheel'), fc.string({ maxLength: 6 })),
			toStage: fc.constantFrom(...STAGES, 'nowhere')
		},
		{ requiredKeys: [] }
	)
});

test('random action sequences: the state is always valid, terminal stays terminal, replay equals the state', () => {
	fc.assert(
		fc.property(fc.array(step, { maxLength: 60 }), (steps) => {
			let state: UnitState = 'received';
			let held = false;
			let holdReason: string | null = null;
			const history: HistoryEntry[] = [{ action: 'receive', fromState: null, toState: 'received' }];
			for (const s of steps) {
				const before = state;
				const d = decide({ serial: 'SY-00001', state, held, holdReason }, { ...s, action: s.action as ActionName }, { scrapReasonCodes: ['TH-CRACK', 'BORE'] });
				if (d.ok) {
					expect(d.from).toBe(before);
					history.push({ action: s.action, fromState: d.from, toState: d.to, data: d.data });
					state = d.to;
					held = d.held;
					holdReason = d.holdReason;
				}
				expect(UNIT_STATES).toContain(state);
				expect(isTerminal(before) ? state : before).toBe(before);
				expect(held && TERMINAL_STATES.includes(state)).toBe(false);
			}
			expect(replay('SY-00001', history)).toEqual({ state, held, holdReason });
		}),
		{ numRuns: 2000 }
	);
});

test('a steering role can always walk a fresh unit to shipped by the main moves', () => {
	fc.assert(
		fc.property(fc.constantFrom('lead', 'owner'), (role) => {
			let state: UnitState = 'received';
			for (const action of ['inspect', 'accept', 'clean', 'machine', 'paint', 'assemble', 'balance', 'pack', 'ship'] as const) {
				const d = decide({ serial: 'SY-00002', state, held: false, holdReason: null }, { action, role: role as 'lead' | 'owner', stationStage: null });
				expect(d.ok).toBe(true);
				if (d.ok) state = d.to;
			}
			expect(state).toBe('shipped');
		})
	);
});

/*
 * The walk: each step asks the machine which moves it allows from where the unit is (every role,
 * at the right station, at a wrong one, away from one; holds, release, rework to every stage,
 * scrap, a customer's return, and undo by whoever may) and makes one of them; about 15 % of the
 * steps try a move the machine refuses instead. The rules checked on every allowed move are
 * written out here by hand, not read from the machine's tables.
 */

/** The good route, by hand: action → [from, to]. */
const ROUTE: Partial<Record<ActionName, [UnitState, UnitState]>> = {
	inspect: ['received', 'inspected'],
	accept: ['inspected', 'accepted'],
	clean: ['accepted', 'cleaned'],
	machine: ['cleaned', 'machined'],
	paint: ['machined', 'painted'],
	assemble: ['painted', 'assembled'],
	balance: ['assembled', 'balanced'],
	pack: ['balanced', 'packed'],
	ship: ['packed', 'shipped']
};
const ORDER: UnitState[] = ['received', 'inspected', 'accepted', 'cleaned', 'machined', 'painted', 'assembled', 'balanced', 'packed', 'shipped'];
/** The state a unit sent back to a stage is left in (it waits for that stage again). */
const BACK_TO: Record<Stage, UnitState> = {
	teardown: 'received',
	clean: 'accepted',
	machine: 'cleaned',
	paint: 'machined',
	assemble: 'painted',
	balance: 'assembled',
	pack: 'balanced',
	ship: 'packed'
};
const STAGE_OF: Partial<Record<ActionName, Stage>> = {
	inspect: 'teardown',
	accept: 'teardown',
	clean: 'clean',
	machine: 'machine',
	paint: 'paint',
	assemble: 'assemble',
	balance: 'balance',
	pack: 'pack',
	ship: 'ship'
};
const WAITS_FOR: Partial<Record<UnitState, Stage>> = {
	received: 'teardown',
	inspected: 'teardown',
	accepted: 'clean',
	cleaned: 'machine',
	machined: 'paint',
	painted: 'assemble',
	assembled: 'balance',
	balanced: 'pack',
	packed: 'ship'
};

/** What the shop knows about one unit beside its row: a customer's unit and its quote, build records, a checklist. */
const factsArb = fc
	.record({
		customer: fc.integer({ min: 0, max: 99 }),
		quote: fc.constantFrom('none', 'sent', 'approved', 'declined'),
		assembly: fc.integer({ min: 0, max: 99 }),
		balance: fc.integer({ min: 0, max: 99 }),
		checklist: fc.boolean(),
		inspection: fc.integer({ min: 0, max: 99 })
	})
	.map(({ customer, quote, assembly, balance, checklist, inspection }): UnitFacts => {
		const isCustomer = customer < 35;
		return {
			scrapReasonCodes: ['TH-CRACK', 'BORE'],
			hasAssemblyRecord: assembly >= 8,
			hasPassingBalance: balance >= 8,
			inspectionRequired: checklist,
			hasInspectionRecord: inspection >= 8,
			customerUnit: isCustomer,
			quoteApproved: isCustomer ? quote === 'approved' : null,
			quoteDeclined: isCustomer && quote === 'declined'
		};
	});

const walkStep = fc.record({
	/** < 15: try a move the machine refuses. */
	kind: fc.noBias(fc.integer({ min: 0, max: 99 })),
	/** Which move, uniform in [0, 1) (unbiased: fast-check leans towards small numbers otherwise). */
	pick: fc.noBias(fc.integer({ min: 0, max: 999_999 })).map((n) => n / 1_000_000),
	/** Seconds since the last step; now and then past the undo window. */
	gap: fc.oneof({ weight: 9, arbitrary: fc.integer({ min: 2, max: 90 }) }, { weight: 1, arbitrary: fc.integer({ min: 121, max: 3600 }) })
});

const SERIAL = 'SY-04242';
const ALL_ASKS = everyAsk();

/**
 * `decide` is pure, so the machine's answer for the same unit, facts and asks is the same every
 * time: the lists are kept per (state, hold, facts). Each move the walk makes is decided afresh.
 */
const sortedCache = new Map<string, ReturnType<typeof sortAsks>>();
function sortedFor(unit: { serial: string; state: UnitState; held: boolean; holdReason: string | null }, facts: UnitFacts, every = false) {
	const key = `${every}|${unit.state}|${unit.held}|${unit.holdReason}|${JSON.stringify(facts)}`;
	let sorted = sortedCache.get(key);
	if (!sorted) sortedCache.set(key, (sorted = sortAsks(unit, facts, every ? ALL_ASKS : asksFor(unit.state))));
	return sorted;
}

type Pick = { kind: 'move'; ask: MoveAsk } | { kind: 'undo'; userId: string };

class RuleBroken extends Error {}
/** A check in the walk's inner loop (an `expect` costs ~12 µs; this runs about a million times). */
function must(ok: unknown, what: () => string): asserts ok {
	if (!ok) throw new RuleBroken(what());
}

test('walking the whole machine: every state is reached many times, every move obeys the rules, terminal stays terminal', () => {
	const reached = Object.fromEntries(UNIT_STATES.map((s) => [s, 0])) as Record<UnitState, number>;
	const made = new Map<string, number>();
	let refusedTries = 0;
	let terminalChecks = 0;
	let quoteHeld = 0;
	const count = (key: string) => made.set(key, (made.get(key) ?? 0) + 1);

	fc.assert(
		fc.property(factsArb, fc.array(walkStep, { minLength: 20, maxLength: 70 }), (facts, steps) => {
			let now = Date.UTC(2026, 11, 1, 8);
			let unit = { serial: SERIAL, state: 'received' as UnitState, held: false, holdReason: null as string | null };
			const history: UndoHistoryEntry[] = [{ seq: 1, action: 'receive', fromState: null, toState: 'received', userId: 'office', at: new Date(now) }];
			reached.received++;
			let checkedTerminal = false;

			for (const s of steps) {
				now += s.gap * 1000;
				const before = { ...unit };
				const at = () => `${before.state}${before.held ? ' (held)' : ''}, facts ${JSON.stringify(facts)}`;
				if (isTerminal(before.state) && !checkedTerminal) {
					// every move by anyone, anywhere, with or without data, is refused, and nobody can undo
					checkedTerminal = true;
					terminalChecks++;
					const allowed = sortedFor(before, facts, true).allowed.map((a) => `${a.ask.action} by ${a.ask.role} at ${a.ask.stationStage ?? 'no station'}`);
					must(allowed.length === 0, () => `${at()}: the machine allows ${allowed.slice(0, 5).join('; ')}`);
					for (const userId of [...ROLES, 'office']) must(!decideUndo(SERIAL, history, { userId }, new Date(now)).ok, () => `${at()}: ${userId} may undo`);
				}

				const sorted = sortedFor(before, facts);
				const last = history[history.length - 1];
				const undoAllowed: Pick[] = [];
				const undoRefused: Pick[] = [];
				for (const userId of new Set([last.userId ?? 'nobody', ...ROLES])) {
					(decideUndo(SERIAL, history, { userId }, new Date(now)).ok ? undoAllowed : undoRefused).push({ kind: 'undo', userId });
				}
				const allowed: Pick[] = [...sorted.allowed.map((a): Pick => ({ kind: 'move', ask: a.ask })), ...undoAllowed];
				const refused: Pick[] = [...sorted.refused, ...sorted.other].map((r): Pick => ({ kind: 'move', ask: r.ask })).concat(undoRefused);
				must(!isTerminal(before.state) || allowed.length === 0, () => `${at()}: moves allowed out of an end state`);
				if (facts.quoteApproved === false && before.state === 'accepted' && !before.held) quoteHeld++;

				if (s.kind < 15 || allowed.length === 0) {
					// a move the machine refuses: a sentence back, nothing changes
					const p = refused[Math.floor(s.pick * refused.length)];
					const d = p.kind === 'move' ? decide(before, p.ask, facts) : decideUndo(SERIAL, history, { userId: p.userId }, new Date(now));
					must(!d.ok, () => `${at()}: ${JSON.stringify(p)} was listed as refused but is allowed`);
					must(/^\S.*[.)]$/.test(d.message), () => `${at()}: "${d.message}" is not a sentence`);
					refusedTries++;
					continue;
				}

				const p = pickWeighted(allowed, (x) => (x.kind === 'undo' ? 'undo' : x.ask.action), s.pick);
				let entry: UndoHistoryEntry;
				if (p.kind === 'undo') {
					const d = decideUndo(SERIAL, history, { userId: p.userId }, new Date(now));
					must(d.ok, () => `${at()}: undo by ${p.userId} listed as allowed, then refused`);
					// the rules of undo, by hand: the maker's own last move, within two minutes, back to where it came from
					must(p.userId === last.userId, () => `${at()}: ${p.userId} undid ${last.userId}'s move`);
					must(now - last.at.getTime() <= 120_000, () => `${at()}: undo after ${(now - last.at.getTime()) / 1000} s`);
					must(last.action !== 'undo' && last.action !== 'receive', () => `${at()}: undid a ${last.action}`);
					must(d.from === before.state && d.to === last.fromState, () => `${at()}: undo ${d.from} → ${d.to} after ${last.fromState} → ${last.toState}`);
					entry = { seq: history.length + 1, action: 'undo', fromState: d.from, toState: d.to, userId: p.userId, at: new Date(now), data: { undoesSeq: d.undoesSeq, held: d.held, holdReason: d.holdReason } };
					unit = { ...unit, state: d.to, held: d.held, holdReason: d.holdReason };
					count('undo');
				} else {
					const { ask } = p;
					const d = decide(before, ask, facts);
					must(d.ok, () => `${at()}: ${JSON.stringify(ask)} listed as allowed, then refused`);
					must(d.from === before.state, () => `${at()}: outcome starts at ${d.from}`);
					const broken = brokenRule(before, ask, facts, d.to, d.held);
					must(broken === null, () => `${at()}: ${ask.action} by ${ask.role} at ${ask.stationStage ?? 'no station'} ${JSON.stringify(ask.data)} → ${d.to}${d.held ? ' held' : ''}: ${broken}`);
					entry = { seq: history.length + 1, action: ask.action, fromState: d.from, toState: d.to, userId: ask.role, at: new Date(now), data: d.data };
					unit = { ...unit, state: d.to, held: d.held, holdReason: d.holdReason };
					count(ask.action === 'rework' ? `rework→${ask.data.toStage}` : ask.action);
				}
				history.push(entry);
				if (entry.toState !== entry.fromState) reached[entry.toState]++;
				must(!(unit.held && isTerminal(unit.state)), () => `${at()}: held in ${unit.state}`);
				const folded = replay(SERIAL, history);
				must(
					folded.state === unit.state && folded.held === unit.held && folded.holdReason === unit.holdReason,
					() => `${at()}: replay ${JSON.stringify(folded)} differs from ${JSON.stringify(unit)}`
				);
			}
			// a customer's unit whose quote is not approved never started work
			must(facts.quoteApproved !== false || !history.some((e) => e.action === 'clean'), () => `cleaned without an approved quote`);
		}),
		{ numRuns: 1500 }
	);

	const moves = Object.fromEntries([...made].sort());
	console.log(`machine walk: states entered ${JSON.stringify(reached)}`);
	console.log(`machine walk: moves made ${JSON.stringify(moves)}; refused tries ${refusedTries}; end-state checks ${terminalChecks}; steps where a customer's quote, not approved, kept an accepted unit from work ${quoteHeld}`);
	for (const state of UNIT_STATES) expect(reached[state], `${state} reached`).toBeGreaterThanOrEqual(50);
	for (const action of ['hold', 'release', 'scrap', 'return', 'undo', 'ship']) expect(made.get(action) ?? 0, `${action} made`).toBeGreaterThanOrEqual(50);
	// rework goes back to clean … pack (never to teardown; back to ship would need a shipped unit)
	for (const stage of STAGES.filter((s) => s !== 'teardown' && s !== 'ship')) expect(made.get(`rework→${stage}`) ?? 0, `rework to ${stage}`).toBeGreaterThanOrEqual(1);
	expect(terminalChecks).toBeGreaterThanOrEqual(500);
	expect(refusedTries).toBeGreaterThanOrEqual(1000);
	expect(quoteHeld).toBeGreaterThanOrEqual(200);
}, 60_000);

/** The shop's rules for an allowed move, stated by hand; the first one broken, or null. */
function brokenRule(before: { state: UnitState; held: boolean }, ask: MoveAsk, facts: UnitFacts, to: UnitState, held: boolean): string | null {
	const steering = ask.role === 'lead' || ask.role === 'owner';
	if (isTerminal(before.state)) return 'moved out of an end state';
	if (before.held && ask.action !== 'release') return 'moved while held';
	if (ask.role === 'office' && ask.action !== 'return') return 'the office moved a unit on the floor';
	if (ask.role === 'tech') {
		// a tech works at a station, on that station's work or on the unit waiting there
		const stage = STAGE_OF[ask.action];
		const inspectedScrap = ask.action === 'scrap' && before.state === 'inspected' && ask.stationStage === 'teardown';
		if (ask.stationStage === null) return 'a tech moved a unit away from a station';
		if (stage && ask.stationStage !== stage) return `a tech did ${stage} work at a ${ask.stationStage} station`;
		if (!stage && !inspectedScrap && ask.stationStage !== WAITS_FOR[before.state]) return `a tech moved a unit that waits for ${WAITS_FOR[before.state]} at ${ask.stationStage}`;
		if (ask.action === 'rework' || ask.action === 'return') return `a tech made a ${ask.action}`;
	} else if (!steering && ask.action !== 'return') return `${ask.role} may not ${ask.action}`;
	switch (ask.action) {
		case 'hold':
			if (to !== before.state || !held) return 'hold changed the state or did not hold';
			break;
		case 'release':
			if (!before.held || to !== before.state || held) return 'release of a free unit, or it changed the state';
			break;
		case 'scrap':
			if (ORDER.indexOf(before.state) < ORDER.indexOf('inspected')) return 'scrapped before teardown';
			if (to !== 'scrapped') return `scrap left it ${to}`;
			break;
		case 'rework': {
			const target = BACK_TO[ask.data.toStage as Stage];
			if (ask.data.toStage === 'teardown' || ORDER.indexOf(target) < ORDER.indexOf('accepted')) return 'sent back to teardown';
			if (ORDER.indexOf(target) >= ORDER.indexOf(before.state)) return 'sent back to a stage it has not been through';
			if (to !== target) return `sent back to ${to}, not ${target}`;
			break;
		}
		case 'return':
			if (!facts.customerUnit || !facts.quoteDeclined) return 'returned without a declined customer quote';
			if (before.state !== 'inspected' && before.state !== 'accepted') return 'returned after work started';
			if (to !== 'shipped') return `returned into ${to}`;
			break;
		default: {
			const route = ROUTE[ask.action];
			if (!route || route[0] !== before.state || route[1] !== to) return `off the route (${route?.join(' → ') ?? 'no route'})`;
		}
	}
	if (ask.action !== 'hold' && held) return 'held after a move other than hold';
	if (ask.action === 'clean' && facts.quoteApproved === false) return 'work started before the quote was approved';
	if (ask.action === 'assemble' && !facts.hasAssemblyRecord) return 'assembled without an assembly record';
	if (ask.action === 'balance' && !facts.hasPassingBalance) return 'balanced without a passing run';
	if (ask.action === 'accept' && facts.inspectionRequired && !facts.hasInspectionRecord) return 'accepted without the checklist';
	return null;
}
