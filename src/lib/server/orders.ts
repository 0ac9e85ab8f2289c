/**
 * Orders: a channel, a due date and lines of model × quantity. Created one at a time by the
 * office or the lead, or imported from a CSV file — every order of a file in one transaction,
 * or none when a single row is bad.
 */
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { ORDER_CHANNELS, ORDER_STATUSES, type OrderChannel, type OrderStatus } from '../domain/orders/channels';
import { checkMapping, checkOrderRows, parseCsv, type OrderCheck, type OrderMapping, type RowProblem } from '../domain/orders/order-csv';
import { isDate } from '../domain/plan/weeks';
import type { Db, DbOrTx } from './db';
import { customerOrder, orderLine, turboModel } from './db/schema';
import { publish } from './live';
import type { Actor } from './units';
import { requiredNumber } from '../domain/input/fields';

export interface OrderView {
	id: number;
	ref: string;
	channel: OrderChannel;
	customer: string;
	orderedOn: string;
	dueOn: string | null;
	status: OrderStatus;
	notes: string;
	lines: { model: string; quantity: number }[];
	units: number;
}

export function listOrders(db: DbOrTx, filter: { status?: OrderStatus | 'all'; limit?: number } = {}): OrderView[] {
	const status = filter.status ?? 'open';
	const orders = db
		.select()
		.from(customerOrder)
		.where(status === 'all' ? undefined : eq(customerOrder.status, status))
		.orderBy(sql`${customerOrder.dueOn} is null`, asc(customerOrder.dueOn), desc(customerOrder.orderedOn), asc(customerOrder.id))
		.limit(filter.limit ?? 500)
		.all();
	if (orders.length === 0) return [];
	const lines = db
		.select({ orderId: orderLine.orderId, model: turboModel.code, quantity: orderLine.quantity })
		.from(orderLine)
		.innerJoin(turboModel, eq(turboModel.id, orderLine.modelId))
		.where(inArray(orderLine.orderId, orders.map((o) => o.id)))
		.orderBy(asc(orderLine.id))
		.all();
	return orders.map((o) => {
		const own = lines.filter((l) => l.orderId === o.id).map(({ model, quantity }) => ({ model, quantity }));
		return {
			id: o.id,
			ref: o.ref,
			channel: o.channel,
			customer: o.customer,
			orderedOn: o.orderedOn,
			dueOn: o.dueOn,
			status: o.status,
			notes: o.notes,
			lines: own,
			units: own.reduce((a, l) => a + l.quantity, 0)
		};
	});
}

const dateOrEmpty = z
	.string()
	.trim()
	.refine((v) => v === '' || isDate(v), 'Write the date as YYYY-MM-DD.');

export const orderInputSchema = z.object({
	ref: z.string().trim().min(1, 'Give the order a reference.').max(60, 'Keep the reference under 60 characters.'),
	channel: z.enum(ORDER_CHANNELS, 'Choose a channel.'),
	customer: z.string().trim().max(120).default(''),
	orderedOn: dateOrEmpty.default(''),
	dueOn: dateOrEmpty.default(''),
	notes: z.string().trim().max(500).default(''),
	lines: z
		.array(z.object({ model: z.string().trim().min(1, 'Choose a model.'), quantity: requiredNumber('Quantity', { blank: 'Give the quantity of each line.', int: true, whole: 'Whole units only.', min: 1, max: 10_000, range: 'Quantity: from 1 to 10000 on a line.' }) }))
		.min(1, 'An order needs at least one line.')
		.max(50)
});
export type OrderInput = z.input<typeof orderInputSchema>;

export type SaveOrdersResult =
	| { ok: true; ids: number[] }
	| { ok: false; status: 400 | 409; message: string; fields?: Record<string, string[]>; bad?: RowProblem[] };

function today(now: Date): string {
	return now.toISOString().slice(0, 10);
}

function modelIds(tx: DbOrTx): Map<string, number> {
	return new Map(tx.select({ id: turboModel.id, code: turboModel.code }).from(turboModel).all().map((m) => [m.code, m.id]));
}

function insertOrder(tx: DbOrTx, actor: Actor, models: Map<string, number>, o: { ref: string; channel: OrderChannel; customer: string; orderedOn: string; dueOn: string | null; notes: string; lines: { model: string; quantity: number }[] }): number {
	const created = tx
		.insert(customerOrder)
		.values({ ref: o.ref, channel: o.channel, customer: o.customer, orderedOn: o.orderedOn, dueOn: o.dueOn, notes: o.notes, createdBy: actor.id })
		.returning({ id: customerOrder.id })
		.get();
	for (const l of o.lines) tx.insert(orderLine).values({ orderId: created.id, modelId: models.get(l.model)!, quantity: l.quantity }).run();
	return created.id;
}

export function createOrder(db: Db, actor: Actor, input: OrderInput, now = new Date()): SaveOrdersResult {
	const parsed = orderInputSchema.safeParse(input);
	if (!parsed.success) {
		const fields: Record<string, string[]> = Object.create(null);
		for (const i of parsed.error.issues) (fields[i.path.join('.') || '_'] ??= []).push(i.message);
		return { ok: false, status: 400, message: parsed.error.issues[0]?.message ?? 'Check the order.', fields };
	}
	const v = parsed.data;
	const orderedOn = v.orderedOn || today(now);
	const dueOn = v.dueOn || null;
	if (dueOn && dueOn < orderedOn) return { ok: false, status: 400, message: 'The due date is before the order date.', fields: { dueOn: ['The due date is before the order date.'] } };
	const result = db.transaction(
		(tx): SaveOrdersResult => {
			const models = modelIds(tx);
			const unknown = v.lines.find((l) => !models.has(l.model));
			if (unknown) return { ok: false, status: 400, message: `There is no model ${unknown.model}.`, fields: { lines: [`There is no model ${unknown.model}.`] } };
			if (tx.select({ id: customerOrder.id }).from(customerOrder).where(eq(customerOrder.ref, v.ref)).get()) {
				return { ok: false, status: 409, message: `Order ${v.ref} already exists.`, fields: { ref: [`Order ${v.ref} already exists.`] } };
			}
			const merged = new Map<string, number>();
			for (const l of v.lines) merged.set(l.model, (merged.get(l.model) ?? 0) + l.quantity);
			const id = insertOrder(tx, actor, models, { ...v, orderedOn, dueOn, lines: [...merged].map(([model, quantity]) => ({ model, quantity })) });
			return { ok: true, ids: [id] };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok) publish({ topic: 'order', kind: 'created', orderIds: result.ids, at: now.toISOString() });
	return result;
}

export interface ImportPreview {
	headers: string[];
	sample: Record<string, string>[];
	rowCount: number;
	mapping: OrderMapping;
	problems: string[];
	check: OrderCheck | null;
}

function context(db: DbOrTx, refs: string[], now: Date) {
	const existing =
		refs.length === 0
			? []
			: db
					.select({ ref: customerOrder.ref })
					.from(customerOrder)
					.where(inArray(customerOrder.ref, [...new Set(refs)].slice(0, 5000)))
					.all()
					.map((r) => r.ref);
	return { modelCodes: [...modelIds(db).keys()], existingRefs: new Set(existing), today: today(now) };
}

/** Read a file and check it against a mapping (or a guessed one): what would be imported, and what is wrong. */
export function previewOrderImport(db: DbOrTx, text: string, mapping: OrderMapping | null, guess: (h: string[]) => OrderMapping, now = new Date()): ImportPreview {
	const parsed = parseCsv(text);
	const used = mapping ?? guess(parsed.headers);
	const problems = [...parsed.problems];
	if (!problems.length) problems.push(...checkMapping(used, parsed.headers));
	let check: OrderCheck | null = null;
	if (!problems.length) {
		const refs = used.ref ? parsed.rows.map((r) => (r[used.ref!] ?? '').trim()).filter(Boolean) : [];
		check = checkOrderRows(parsed.rows, used, context(db, refs, now));
	}
	return { headers: parsed.headers, sample: parsed.rows.slice(0, 5), rowCount: parsed.rows.length, mapping: used, problems, check };
}

/** Import every order in the file, or none: the file is checked again inside the transaction. */
export function importOrders(db: Db, actor: Actor, text: string, mapping: OrderMapping, now = new Date()): SaveOrdersResult & { orders?: number; lines?: number } {
	const parsed = parseCsv(text);
	const problems = parsed.problems.length ? parsed.problems : checkMapping(mapping, parsed.headers);
	if (problems.length) return { ok: false, status: 400, message: problems[0] };
	if (parsed.rows.length === 0) return { ok: false, status: 400, message: 'The file has a header but no rows.' };
	let counts = { orders: 0, lines: 0 };
	const result = db.transaction(
		(tx): SaveOrdersResult => {
			const refs = parsed.rows.map((r) => (r[mapping.ref!] ?? '').trim()).filter(Boolean);
			const check = checkOrderRows(parsed.rows, mapping, context(tx, refs, now));
			if (check.bad.length) {
				return { ok: false, status: 400, message: `${check.bad.length} row${check.bad.length === 1 ? ' has' : 's have'} problems; nothing was imported. Fix the file and try again.`, bad: check.bad };
			}
			const models = modelIds(tx);
			const ids = check.orders.map((o) => insertOrder(tx, actor, models, o));
			counts = { orders: ids.length, lines: check.orders.reduce((a, o) => a + o.lines.length, 0) };
			return { ok: true, ids };
		},
		{ behavior: 'immediate' }
	);
	if (result.ok) publish({ topic: 'order', kind: 'imported', orderIds: result.ids, at: now.toISOString() });
	return result.ok ? { ...result, ...counts } : result;
}

export function setOrderStatus(db: Db, id: number, status: OrderStatus, now = new Date()): boolean {
	if (!(ORDER_STATUSES as readonly string[]).includes(status)) return false;
	const done = db.update(customerOrder).set({ status }).where(and(eq(customerOrder.id, id))).run();
	if (done.changes === 1) publish({ topic: 'order', kind: status, orderIds: [id], at: now.toISOString() });
	return done.changes === 1;
}
