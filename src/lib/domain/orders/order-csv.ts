/**
 * Reading an order file: parse CSV, map its columns onto order fields, and check every row
 * before anything is saved. Rows sharing an order reference are the lines of one order.
 * The result is either a list of orders ready to save or a list of bad rows with reasons;
 * the service saves all the orders in one transaction, or none.
 */
import Papa from 'papaparse';
import { isDate } from '../plan/weeks';
import { CHANNEL_LABEL, parseChannel, type OrderChannel } from './channels';

export const ORDER_FIELDS = ['ref', 'channel', 'model', 'quantity', 'dueOn', 'orderedOn', 'customer', 'notes'] as const;
export type OrderField = (typeof ORDER_FIELDS)[number];

export const ORDER_FIELD_INFO: Record<OrderField, { label: string; required: boolean; aliases: string[] }> = {
	ref: { label: 'Order reference', required: true, aliases: ['ref', 'reference', 'order', 'order ref', 'order no', 'order number', 'po', 'po number'] },
	channel: { label: 'Channel', required: true, aliases: ['channel', 'depot', 'location', 'source', 'from'] },
	model: { label: 'Model', required: true, aliases: ['model', 'part', 'part number', 'item', 'sku', 'turbo'] },
	quantity: { label: 'Quantity', required: true, aliases: ['quantity', 'qty', 'count', 'units', 'number'] },
	dueOn: { label: 'Due date', required: false, aliases: ['due', 'due date', 'due on', 'needed by', 'ship by'] },
	orderedOn: { label: 'Order date', required: false, aliases: ['ordered', 'order date', 'ordered on', 'date', 'placed'] },
	customer: { label: 'Customer', required: false, aliases: ['customer', 'name', 'account', 'ship to'] },
	notes: { label: 'Notes', required: false, aliases: ['notes', 'note', 'comment', 'comments', 'remarks'] }
};

/** Field → the file's column header that holds it. */
export type OrderMapping = Partial<Record<OrderField, string>>;

export const MAX_ROWS = 5000;
export const MAX_QUANTITY = 10_000;

export interface ParsedCsv {
	headers: string[];
	rows: Record<string, string>[];
	/** Problems with the file as a whole (no header, too many rows, broken quoting). */
	problems: string[];
}

export function parseCsv(text: string): ParsedCsv {
	const clean = text.replace(/^\uFEFF/, '');
	if (!clean.trim()) return { headers: [], rows: [], problems: ['The file is empty.'] };
	const first = Papa.parse<string[]>(clean, { header: false, preview: 1 });
	const raw = (first.data[0] ?? []).map((h) => h.trim());
	const dup = raw.find((h, i) => h !== '' && raw.indexOf(h) !== i);
	if (dup) return { headers: [], rows: [], problems: [`Two columns are both called "${dup}"; rename one.`] };
	const result = Papa.parse<Record<string, string>>(clean, {
		header: true,
		skipEmptyLines: 'greedy',
		transformHeader: (h) => h.trim()
	});
	const headers = (result.meta.fields ?? []).filter((h) => h !== '');
	const problems: string[] = [];
	if (headers.length === 0) problems.push('The first line should name the columns.');
	for (const e of result.errors.slice(0, 5)) {
		if (e.code === 'TooFewFields' || e.code === 'TooManyFields') continue; // reported per row below
		problems.push(`Row ${(e.row ?? 0) + 2}: ${e.message}.`);
	}
	if (result.data.length > MAX_ROWS) problems.push(`The file has ${result.data.length} rows; import at most ${MAX_ROWS} at a time.`);
	const rows = result.data.map((r) => {
		const out: Record<string, string> = {};
		for (const h of headers) out[h] = typeof r[h] === 'string' ? r[h].trim() : '';
		return out;
	});
	return { headers, rows, problems };
}

function norm(s: string): string {
	return s.toLowerCase().replace(/[^a-z0-9]+/g, ' ').trim();
}

/** A first guess at the mapping from the column names. */
export function guessMapping(headers: readonly string[]): OrderMapping {
	const mapping: OrderMapping = {};
	const used = new Set<string>();
	for (const f of ORDER_FIELDS) {
		const h = headers.find((h) => !used.has(h) && ORDER_FIELD_INFO[f].aliases.includes(norm(h)));
		if (h) {
			mapping[f] = h;
			used.add(h);
		}
	}
	return mapping;
}

/** Problems with a mapping: a required field not mapped, a column that does not exist or is used twice. */
export function checkMapping(mapping: OrderMapping, headers: readonly string[]): string[] {
	const problems: string[] = [];
	const seen = new Map<string, OrderField>();
	for (const f of ORDER_FIELDS) {
		const h = mapping[f];
		if (!h) {
			if (ORDER_FIELD_INFO[f].required) problems.push(`Choose the column that holds the ${ORDER_FIELD_INFO[f].label.toLowerCase()}.`);
			continue;
		}
		if (!headers.includes(h)) problems.push(`There is no column "${h}" in the file.`);
		const other = seen.get(h);
		if (other) problems.push(`Column "${h}" is chosen for both ${ORDER_FIELD_INFO[other].label.toLowerCase()} and ${ORDER_FIELD_INFO[f].label.toLowerCase()}.`);
		seen.set(h, f);
	}
	return problems;
}

export interface OrderDraft {
	ref: string;
	channel: OrderChannel;
	customer: string;
	orderedOn: string;
	dueOn: string | null;
	notes: string;
	lines: { model: string; quantity: number }[];
	/** File rows (2 = the first row under the header) that make up the order. */
	rows: number[];
}

export interface RowProblem {
	/** The row number as a spreadsheet shows it: the header is row 1. */
	row: number;
	ref: string;
	reasons: string[];
}

export interface OrderCheck {
	orders: OrderDraft[];
	bad: RowProblem[];
	lineCount: number;
}

export interface OrderContext {
	/** Model codes the shop builds (exact, as in the model list). */
	modelCodes: readonly string[];
	/** References already used by saved orders. */
	existingRefs: ReadonlySet<string>;
	/** Default order date for rows without one. */
	today: string;
}

/** Check every row against the mapping and the shop's models; group good rows into orders. */
export function checkOrderRows(rows: readonly Record<string, string>[], mapping: OrderMapping, ctx: OrderContext): OrderCheck {
	const models = new Map(ctx.modelCodes.map((m) => [m.toUpperCase(), m]));
	const get = (r: Record<string, string>, f: OrderField) => (mapping[f] ? (r[mapping[f]!] ?? '').trim() : '');
	const orders = new Map<string, OrderDraft>();
	const bad: RowProblem[] = [];
	const badRefs = new Set<string>();
	let lineCount = 0;

	rows.forEach((r, i) => {
		const row = i + 2;
		const reasons: string[] = [];
		const ref = get(r, 'ref');
		if (!ref) reasons.push('The order reference is empty.');
		else if (ref.length > 60) reasons.push('The order reference is longer than 60 characters.');
		else if (ctx.existingRefs.has(ref)) reasons.push(`Order ${ref} is already in Spoolyard.`);

		const channelRaw = get(r, 'channel');
		const channel = parseChannel(channelRaw);
		if (!channelRaw) reasons.push('The channel is empty.');
		else if (!channel) reasons.push(`"${channelRaw}" is not a channel; use a depot (North, Lakes, Plains, Coast), Web or Walk-in.`);

		const modelRaw = get(r, 'model');
		const model = models.get(modelRaw.toUpperCase());
		if (!modelRaw) reasons.push('The model is empty.');
		else if (!model) reasons.push(`"${modelRaw}" is not one of the shop's models.`);

		const qtyRaw = get(r, 'quantity');
		const quantity = /^\d+$/.test(qtyRaw) ? Number(qtyRaw) : NaN;
		if (!qtyRaw) reasons.push('The quantity is empty.');
		else if (!Number.isInteger(quantity) || quantity < 1) reasons.push(`"${qtyRaw}" is not a whole number of units above zero.`);
		else if (quantity > MAX_QUANTITY) reasons.push(`${quantity} units on one line is more than ${MAX_QUANTITY}; check the quantity.`);

		const dueRaw = get(r, 'dueOn');
		if (dueRaw && !isDate(dueRaw)) reasons.push(`Due date "${dueRaw}" is not a date written YYYY-MM-DD.`);
		const orderedRaw = get(r, 'orderedOn');
		if (orderedRaw && !isDate(orderedRaw)) reasons.push(`Order date "${orderedRaw}" is not a date written YYYY-MM-DD.`);
		const orderedOn = orderedRaw || ctx.today;
		const dueOn = dueRaw || null;
		if (dueOn && isDate(dueOn) && isDate(orderedOn) && dueOn < orderedOn) reasons.push(`The due date ${dueOn} is before the order date ${orderedOn}.`);

		const customer = get(r, 'customer').slice(0, 120);
		const notes = get(r, 'notes').slice(0, 500);

		const prior = ref ? orders.get(ref) : undefined;
		if (prior && channel && reasons.length === 0) {
			const clash = (what: string, a: string, b: string) =>
				reasons.push(`Order ${ref} has ${what} ${a} on row ${prior.rows[0]} but ${b} here; one order has one ${what}.`);
			if (prior.channel !== channel) clash('channel', CHANNEL_LABEL[prior.channel], CHANNEL_LABEL[channel]);
			if (prior.dueOn !== dueOn) clash('due date', prior.dueOn ?? '(none)', dueOn ?? '(none)');
			if (prior.orderedOn !== orderedOn) clash('order date', prior.orderedOn, orderedOn);
			if (customer && prior.customer && prior.customer !== customer) clash('customer', prior.customer, customer);
		}

		if (reasons.length) {
			bad.push({ row, ref, reasons });
			if (ref) badRefs.add(ref);
			return;
		}
		lineCount += 1;
		if (prior) {
			const line = prior.lines.find((l) => l.model === model);
			if (line) line.quantity += quantity;
			else prior.lines.push({ model: model!, quantity });
			prior.rows.push(row);
			if (!prior.customer) prior.customer = customer;
		} else {
			orders.set(ref, { ref, channel: channel!, customer, orderedOn, dueOn, notes, lines: [{ model: model!, quantity }], rows: [row] });
		}
	});

	return { orders: [...orders.values()], bad, lineCount };
}
