/**
 * Priority cards: create, edit, close and reopen, reorder, and move units between cards.
 * Every change is one immediate transaction that checks the card's `version` (a stale save
 * is refused with the current state), appends to the card's change log and, after commit,
 * publishes a live `card` message.
 */
import { and, asc, desc, eq, inArray, max, notInArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { CARD_STYLE_KEYS, type CardStyleKey } from '../domain/cards/card-style';
import { STAGE_INFO, STAGES, TERMINAL_STATES, type Stage } from '../domain/units/states';
import { normalizeSerial } from '../domain/units/serial';
import { isDate } from '../domain/plan/weeks';
import type { Db, DbOrTx, Tx } from './db';
import { coreLot, priorityCard, priorityCardChange, priorityCardUnit, turboModel, unit, user, type PriorityCard } from './db/schema';
import { publish } from './live';
import type { Actor } from './units';

export interface CardView {
	id: number;
	title: string;
	dueOn: string | null;
	rank: number;
	style: CardStyleKey;
	kind: 'units' | 'rule';
	rule: { model: string | null; stage: Stage | null; lot: string | null } | null;
	/** The rule in words, or "N units". */
	scope: string;
	open: boolean;
	version: number;
	/** Units on a units card; for a rule card, the units waiting that match it now. */
	unitCount: number;
	updatedAt: string;
	updatedBy: string | null;
}

export type CardResult =
	| { ok: true; card: CardView }
	| { ok: false; status: 400 | 404 | 409; code: 'invalid' | 'not_found' | 'version_conflict'; message: string; fields?: Record<string, string[]>; current?: CardView };

const dateField = z
	.string()
	.trim()
	.refine((v) => v === '' || isDate(v), 'Write the date as YYYY-MM-DD.')
	.transform((v) => (v === '' ? null : v));

export const cardInputSchema = z
	.object({
		title: z.string().trim().min(1, 'Give the card a title.').max(80, 'Keep the title under 80 characters.'),
		dueOn: dateField.optional().default(''),
		style: z.enum(CARD_STYLE_KEYS),
		kind: z.enum(['units', 'rule']),
		ruleModel: z.string().trim().max(40).optional().default(''),
		ruleStage: z.union([z.enum(STAGES), z.literal('')]).optional().default(''),
		ruleLot: z.string().trim().max(40).optional().default(''),
		/** Serials to put on a new units card, separated by spaces, commas or new lines. */
		serials: z.string().max(20_000).optional().default('')
	})
	.superRefine((v, ctx) => {
		if (v.kind === 'rule' && !v.ruleModel && !v.ruleStage && !v.ruleLot) {
			ctx.addIssue({ code: 'custom', path: ['ruleModel'], message: 'A rule card needs a model, a stage or a lot.' });
		}
	});
export type CardInput = z.input<typeof cardInputSchema>;

function viewQuery(db: DbOrTx) {
	const units = db
		.select({ cardId: priorityCardUnit.cardId, n: sql<number>`count(*)`.as('n') })
		.from(priorityCardUnit)
		.innerJoin(unit, eq(unit.id, priorityCardUnit.unitId))
		.where(notInArray(unit.state, [...TERMINAL_STATES]))
		.groupBy(priorityCardUnit.cardId)
		.as('cu');
	return db
		.select({ card: priorityCard, model: turboModel.code, lot: coreLot.code, updatedBy: user.name, n: units.n })
		.from(priorityCard)
		.leftJoin(turboModel, eq(turboModel.id, priorityCard.ruleModelId))
		.leftJoin(coreLot, eq(coreLot.id, priorityCard.ruleLotId))
		.leftJoin(user, eq(user.id, priorityCard.updatedBy))
		.leftJoin(units, eq(units.cardId, priorityCard.id));
}

function ruleCount(db: DbOrTx, c: PriorityCard): number {
	const conds = [notInArray(unit.state, [...TERMINAL_STATES])];
	if (c.ruleModelId !== null) conds.push(eq(unit.modelId, c.ruleModelId));
	if (c.ruleLotId !== null) conds.push(eq(unit.lotId, c.ruleLotId));
	if (c.ruleStage) conds.push(inArray(unit.state, [...STAGE_INFO[c.ruleStage].input]));
	return db.select({ n: sql<number>`count(*)` }).from(unit).where(and(...conds)).get()?.n ?? 0;
}

function toView(db: DbOrTx, r: { card: PriorityCard; model: string | null; lot: string | null; updatedBy: string | null; n: number | null }): CardView {
	const c = r.card;
	const rule = c.kind === 'rule' ? { model: r.model, stage: c.ruleStage, lot: r.lot } : null;
	const count = c.kind === 'units' ? (r.n ?? 0) : ruleCount(db, c);
	const scope = rule
		? [rule.model, rule.stage ? `at ${STAGE_INFO[rule.stage].label}` : null, rule.lot ? `lot ${rule.lot}` : null].filter(Boolean).join(' · ') || 'no rule'
		: `${count} unit${count === 1 ? '' : 's'}`;
	return {
		id: c.id,
		title: c.title,
		dueOn: c.dueOn,
		rank: c.rank,
		style: c.style,
		kind: c.kind,
		rule,
		scope,
		open: c.open,
		version: c.version,
		unitCount: count,
		updatedAt: c.updatedAt.toISOString(),
		updatedBy: r.updatedBy
	};
}

export function listCards(db: DbOrTx, open = true): CardView[] {
	return viewQuery(db)
		.where(eq(priorityCard.open, open))
		.orderBy(open ? asc(priorityCard.rank) : desc(priorityCard.closedAt), asc(priorityCard.id))
		.limit(open ? 500 : 50)
		.all()
		.map((r) => toView(db, r));
}

export function getCard(db: DbOrTx, id: number): CardView | null {
	const r = viewQuery(db).where(eq(priorityCard.id, id)).get();
	return r ? toView(db, r) : null;
}

export interface CardChangeView {
	at: string;
	who: string | null;
	kind: string;
	detail: Record<string, unknown> | null;
}

export function cardChanges(db: DbOrTx, cardId: number, limit = 50): CardChangeView[] {
	return db
		.select({ c: priorityCardChange, who: user.name })
		.from(priorityCardChange)
		.leftJoin(user, eq(user.id, priorityCardChange.userId))
		.where(eq(priorityCardChange.cardId, cardId))
		.orderBy(desc(priorityCardChange.at), desc(priorityCardChange.id))
		.limit(limit)
		.all()
		.map((r) => ({ at: r.c.at.toISOString(), who: r.who, kind: r.c.kind, detail: r.c.detail ?? null }));
}

/** The most recent changes on every card, for the board's log. */
export function recentCardChanges(db: DbOrTx, limit = 30) {
	return db
		.select({ c: priorityCardChange, who: user.name, title: priorityCard.title })
		.from(priorityCardChange)
		.innerJoin(priorityCard, eq(priorityCard.id, priorityCardChange.cardId))
		.leftJoin(user, eq(user.id, priorityCardChange.userId))
		.orderBy(desc(priorityCardChange.at), desc(priorityCardChange.id))
		.limit(limit)
		.all()
		.map((r) => ({ at: r.c.at.toISOString(), who: r.who, card: r.title, cardId: r.c.cardId, kind: r.c.kind, detail: r.c.detail ?? null }));
}

function log(tx: Tx, actor: Actor, cardId: number, kind: string, detail: Record<string, unknown> | null, now: Date) {
	tx.insert(priorityCardChange).values({ cardId, userId: actor.id, at: now, kind, detail }).run();
}

function announce(kind: string, cardIds: number[], now: Date) {
	publish({ topic: 'card', kind, cardIds, at: now.toISOString() });
}

type Resolved = { ruleModelId: number | null; ruleStage: Stage | null; ruleLotId: number | null };

function resolveRule(tx: DbOrTx, v: z.output<typeof cardInputSchema>): { ok: true; rule: Resolved } | { ok: false; fields: Record<string, string[]> } {
	if (v.kind === 'units') return { ok: true, rule: { ruleModelId: null, ruleStage: null, ruleLotId: null } };
	const fields: Record<string, string[]> = Object.create(null);
	let ruleModelId: number | null = null;
	let ruleLotId: number | null = null;
	if (v.ruleModel) {
		ruleModelId = tx.select({ id: turboModel.id }).from(turboModel).where(eq(turboModel.code, v.ruleModel.toUpperCase())).get()?.id ?? null;
		if (ruleModelId === null) fields.ruleModel = [`There is no model ${v.ruleModel}.`];
	}
	if (v.ruleLot) {
		ruleLotId = tx.select({ id: coreLot.id }).from(coreLot).where(eq(coreLot.code, v.ruleLot)).get()?.id ?? null;
		if (ruleLotId === null) fields.ruleLot = [`There is no lot ${v.ruleLot}.`];
	}
	if (Object.keys(fields).length) return { ok: false, fields };
	return { ok: true, rule: { ruleModelId, ruleStage: v.ruleStage || null, ruleLotId } };
}

function invalid(fields: Record<string, string[]>): CardResult {
	const first = Object.values(fields)[0]?.[0] ?? 'Check the card.';
	return { ok: false, status: 400, code: 'invalid', message: first, fields };
}

export function parseSerials(text: string): string[] {
	return text
		.split(/[\s,;]+/)
		.filter(Boolean)
		.map((s) => normalizeSerial(s) ?? s);
}

/** Find units by serial; unknown ones are named in the refusal. */
function findUnits(tx: DbOrTx, serials: string[]): { ok: true; units: { id: number; serial: string }[] } | { ok: false; message: string } {
	const unique = [...new Set(serials)];
	if (unique.length === 0) return { ok: true, units: [] };
	if (unique.length > 2000) return { ok: false, message: 'Move at most 2000 units at a time.' };
	const found = tx.select({ id: unit.id, serial: unit.serial }).from(unit).where(inArray(unit.serial, unique)).all();
	const missing = unique.filter((s) => !found.some((f) => f.serial === s));
	if (missing.length) return { ok: false, message: `No unit ${missing.slice(0, 5).join(', ')}${missing.length > 5 ? ` and ${missing.length - 5} more` : ''}.` };
	return { ok: true, units: found };
}

export function createCard(db: Db, actor: Actor, input: CardInput, now = new Date()): CardResult {
	const parsed = cardInputSchema.safeParse(input);
	if (!parsed.success) {
		const fields: Record<string, string[]> = Object.create(null);
		for (const i of parsed.error.issues) (fields[i.path.join('.') || '_'] ??= []).push(i.message);
		return invalid(fields);
	}
	const v = parsed.data;
	const result = db.transaction(
		(tx): CardResult => {
			const rule = resolveRule(tx, v);
			if (!rule.ok) return invalid(rule.fields);
			const units: ReturnType<typeof findUnits> = v.kind === 'units' ? findUnits(tx, parseSerials(v.serials)) : { ok: true, units: [] };
			if (!units.ok) return invalid({ serials: [units.message] });
			const top = tx.select({ r: max(priorityCard.rank) }).from(priorityCard).where(eq(priorityCard.open, true)).get()?.r ?? 0;
			const created = tx
				.insert(priorityCard)
				.values({ title: v.title, dueOn: v.dueOn, rank: top + 1, style: v.style, kind: v.kind, ...rule.rule, createdBy: actor.id, updatedBy: actor.id, createdAt: now, updatedAt: now })
				.returning()
				.get();
			log(tx, actor, created.id, 'created', { title: v.title, style: v.style, kind: v.kind, dueOn: v.dueOn, rank: created.rank }, now);
			if (units.units.length) moveInTx(tx, actor, units.units, created.id, now);
			return { ok: true, card: getCard(tx, created.id)! };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok) announce('created', [result.card.id], now);
	return result;
}

function conflict(tx: DbOrTx, id: number, what: string): CardResult {
	const current = getCard(tx, id)!;
	const who = current.updatedBy ?? 'someone';
	const when = current.updatedAt.slice(11, 16);
	return {
		ok: false,
		status: 409,
		code: 'version_conflict',
		message: `${who} changed “${current.title}” at ${when} UTC while you were ${what}. Nothing of yours was saved; here is the card as it is now.`,
		current
	};
}

const EDITABLE = ['title', 'dueOn', 'style', 'kind', 'ruleModelId', 'ruleStage', 'ruleLotId'] as const;

export function updateCard(db: Db, actor: Actor, id: number, expectedVersion: number, input: CardInput, now = new Date()): CardResult {
	const parsed = cardInputSchema.safeParse(input);
	if (!parsed.success) {
		const fields: Record<string, string[]> = Object.create(null);
		for (const i of parsed.error.issues) (fields[i.path.join('.') || '_'] ??= []).push(i.message);
		return invalid(fields);
	}
	const v = parsed.data;
	const result = db.transaction(
		(tx): CardResult => {
			const before = tx.select().from(priorityCard).where(eq(priorityCard.id, id)).get();
			if (!before) return { ok: false, status: 404, code: 'not_found', message: `There is no card ${id}; reload the board.` };
			if (before.version !== expectedVersion) return conflict(tx, id, 'editing it');
			const rule = resolveRule(tx, v);
			if (!rule.ok) return invalid(rule.fields);
			const next = { title: v.title, dueOn: v.dueOn, style: v.style, kind: v.kind, ...rule.rule };
			const changed: Record<string, { from: unknown; to: unknown }> = {};
			for (const k of EDITABLE) if (before[k] !== next[k]) changed[k] = { from: before[k], to: next[k] };
			if (Object.keys(changed).length === 0) return { ok: true, card: getCard(tx, id)! };
			const done = tx
				.update(priorityCard)
				.set({ ...next, version: before.version + 1, updatedAt: now, updatedBy: actor.id })
				.where(and(eq(priorityCard.id, id), eq(priorityCard.version, expectedVersion)))
				.run();
			if (done.changes !== 1) return conflict(tx, id, 'editing it');
			if (v.kind === 'rule' && before.kind === 'units') tx.delete(priorityCardUnit).where(eq(priorityCardUnit.cardId, id)).run();
			log(tx, actor, id, 'edited', changed, now);
			return { ok: true, card: getCard(tx, id)! };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok) announce('edited', [id], now);
	return result;
}

/** Close a card (it stops ordering queues) or reopen it at the bottom of the board. */
export function setCardOpen(db: Db, actor: Actor, id: number, expectedVersion: number, open: boolean, now = new Date()): CardResult {
	const result = db.transaction(
		(tx): CardResult => {
			const before = tx.select().from(priorityCard).where(eq(priorityCard.id, id)).get();
			if (!before) return { ok: false, status: 404, code: 'not_found', message: `There is no card ${id}; reload the board.` };
			if (before.version !== expectedVersion) return conflict(tx, id, open ? 'reopening it' : 'closing it');
			if (before.open === open) return { ok: true, card: getCard(tx, id)! };
			const top = open ? (tx.select({ r: max(priorityCard.rank) }).from(priorityCard).where(eq(priorityCard.open, true)).get()?.r ?? 0) : before.rank;
			tx.update(priorityCard)
				.set({ open, rank: open ? top + 1 : before.rank, closedAt: open ? null : now, version: before.version + 1, updatedAt: now, updatedBy: actor.id })
				.where(eq(priorityCard.id, id))
				.run();
			log(tx, actor, id, open ? 'reopened' : 'closed', null, now);
			return { ok: true, card: getCard(tx, id)! };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok) announce(open ? 'reopened' : 'closed', [id], now);
	return result;
}

export type ReorderResult =
	| { ok: true; cards: CardView[] }
	| { ok: false; status: 400 | 409; code: 'invalid' | 'version_conflict'; message: string; cards: CardView[] };

/**
 * Put the open cards in the order given (top first). The request names every open card with
 * the version it was seen at; if the board changed since, nothing moves and the current board
 * comes back. Only cards whose rank changes get a new version and a log entry.
 */
export function reorderCards(db: Db, actor: Actor, order: readonly { id: number; version: number }[], now = new Date()): ReorderResult {
	let moved: number[] = [];
	const result = db.transaction(
		(tx): ReorderResult => {
			const open = tx.select().from(priorityCard).where(eq(priorityCard.open, true)).all();
			const byId = new Map(open.map((c) => [c.id, c]));
			const ids = order.map((o) => o.id);
			if (new Set(ids).size !== ids.length) return { ok: false, status: 400, code: 'invalid', message: 'A card is named twice in the new order.', cards: listCards(tx) };
			const stale = order.find((o) => byId.get(o.id)?.version !== o.version);
			if (stale || ids.length !== open.length) {
				const c = stale ? byId.get(stale.id) : undefined;
				const why = !c && stale ? 'a card you moved was closed' : ids.length !== open.length ? 'cards were added or closed' : `“${c!.title}” was changed`;
				return { ok: false, status: 409, code: 'version_conflict', message: `The board changed while you were reordering (${why}). Nothing moved; here is the board as it is now — drag again.`, cards: listCards(tx) };
			}
			const changes = order.map((o, i) => ({ id: o.id, from: byId.get(o.id)!.rank, to: i + 1 })).filter((c) => c.from !== c.to);
			for (const c of changes) {
				tx.update(priorityCard)
					.set({ rank: c.to, version: byId.get(c.id)!.version + 1, updatedAt: now, updatedBy: actor.id })
					.where(eq(priorityCard.id, c.id))
					.run();
				log(tx, actor, c.id, 'reordered', { from: c.from, to: c.to }, now);
			}
			moved = changes.map((c) => c.id);
			return { ok: true, cards: listCards(tx) };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok && moved.length) announce('reordered', moved, now);
	return result;
}

function moveInTx(tx: Tx, actor: Actor, units: { id: number; serial: string }[], toCardId: number | null, now: Date): number[] {
	const current = tx
		.select({ unitId: priorityCardUnit.unitId, cardId: priorityCardUnit.cardId })
		.from(priorityCardUnit)
		.where(inArray(priorityCardUnit.unitId, units.map((u) => u.id)))
		.all();
	const from = new Map(current.map((c) => [c.unitId, c.cardId]));
	const out = new Map<number, string[]>();
	const moving: { id: number; serial: string }[] = [];
	for (const u of units) {
		const f = from.get(u.id) ?? null;
		if (f === toCardId) continue;
		moving.push(u);
		if (f !== null) (out.get(f) ?? out.set(f, []).get(f)!).push(u.serial);
	}
	if (moving.length === 0) return [];
	const ids = moving.map((u) => u.id);
	if (toCardId === null) {
		tx.delete(priorityCardUnit).where(inArray(priorityCardUnit.unitId, ids)).run();
	} else {
		for (const u of moving) {
			tx.insert(priorityCardUnit)
				.values({ unitId: u.id, cardId: toCardId, addedAt: now })
				.onConflictDoUpdate({ target: priorityCardUnit.unitId, set: { cardId: toCardId, addedAt: now } })
				.run();
		}
	}
	for (const [cardId, serials] of out) log(tx, actor, cardId, 'units_moved_out', { serials, to: toCardId }, now);
	if (toCardId !== null) log(tx, actor, toCardId, 'units_moved_in', { serials: moving.map((u) => u.serial), from: [...new Set(moving.map((u) => from.get(u.id) ?? null))] }, now);
	return [...out.keys(), ...(toCardId === null ? [] : [toCardId])];
}

export type MoveUnitsResult = { ok: true; moved: number; cards: number[] } | { ok: false; status: 400 | 404 | 409; message: string };

/** Put units on a units card (taking them off any other), or off every card when `toCardId` is null. */
export function moveUnitsToCard(db: Db, actor: Actor, serials: readonly string[], toCardId: number | null, now = new Date()): MoveUnitsResult {
	let touched: number[] = [];
	const result = db.transaction(
		(tx): MoveUnitsResult => {
			if (toCardId !== null) {
				const target = tx.select().from(priorityCard).where(eq(priorityCard.id, toCardId)).get();
				if (!target) return { ok: false, status: 404, message: `There is no card ${toCardId}; reload the board.` };
				if (!target.open) return { ok: false, status: 409, message: `“${target.title}” is closed; reopen it or choose another card.` };
				if (target.kind !== 'units') return { ok: false, status: 400, message: `“${target.title}” is a rule card; units join it by matching its rule.` };
			}
			const found = findUnits(tx, [...serials]);
			if (!found.ok) return { ok: false, status: 404, message: found.message };
			if (found.units.length === 0) return { ok: false, status: 400, message: 'Choose at least one unit to move.' };
			touched = moveInTx(tx, actor, found.units, toCardId, now);
			return { ok: true, moved: touched.length ? found.units.length : 0, cards: touched };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok && touched.length) announce('units_moved', touched, now);
	return result;
}

/** The units on a units card that are still in the shop, oldest first. */
export function cardUnits(db: DbOrTx, cardId: number, limit = 500) {
	return db
		.select({ serial: unit.serial, state: unit.state, model: turboModel.code, lot: coreLot.code })
		.from(priorityCardUnit)
		.innerJoin(unit, eq(unit.id, priorityCardUnit.unitId))
		.innerJoin(turboModel, eq(turboModel.id, unit.modelId))
		.innerJoin(coreLot, eq(coreLot.id, unit.lotId))
		.where(and(eq(priorityCardUnit.cardId, cardId), notInArray(unit.state, [...TERMINAL_STATES])))
		.orderBy(asc(unit.stateSince), asc(unit.id))
		.limit(limit)
		.all();
}
