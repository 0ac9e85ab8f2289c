/**
 * What a stored event's `data` may show on a page. The history is append-only, so a row written
 * by any version of the app (or by hand) stays for ever: whatever is stored, pages get a plain,
 * bounded object of the fields the shop knows, each with the type it should have. Anything else
 * (keys no move declares, a wrong type, text that is not JSON, nesting too deep to show) becomes a
 * short text summary with a notice, never a failure. Svelte and JSON escape it on the way out.
 */
import { MAX_JSON_DEPTH, clip, parseStoredJson, summariseValue } from '../input/json';
import { isActionName } from './actions';
import { isStage, type Stage } from './states';

/** The notice shown beside a summary of data the page could not show field by field. */
export const STORED_DATA_NOTE = 'Stored data could not be shown in full.';

/** The key a stored value that is not a readable JSON object is kept under when read (see `readStoredData`). */
export const UNREADABLE_KEY = '~unreadable';

/** How many characters of unexpected stored data a page shows. */
export const SUMMARY_CHARS = 300;

export interface EventDataView {
	reasonCode?: string;
	reason?: string;
	toStage?: Stage;
	undoesSeq?: number;
	undoesAction?: string;
	held?: boolean;
	holdReason?: string | null;
	labourMinutes?: number;
	failureMode?: string;
	inspected?: boolean;
	unrepaired?: boolean;
	/** A bounded text summary of what could not be shown field by field. */
	unshown?: string;
	/** `STORED_DATA_NOTE` when `unshown` is present. */
	notice?: string;
}

const text = (max: number) => (v: unknown) => (typeof v === 'string' && v.length <= max ? v : undefined);
const bool = (v: unknown) => (typeof v === 'boolean' ? v : undefined);

/** Each field the shop's moves and undos store, with the only shape a page may receive it in. */
const KNOWN: { [K in keyof EventDataView]?: (v: unknown) => EventDataView[K] | undefined } = {
	reasonCode: text(40),
	reason: text(500),
	toStage: (v) => (typeof v === 'string' && isStage(v) ? v : undefined),
	undoesSeq: (v) => (typeof v === 'number' && Number.isSafeInteger(v) && v > 0 ? v : undefined),
	undoesAction: (v) => (typeof v === 'string' && (isActionName(v) || v === 'undo') ? v : undefined),
	held: bool,
	holdReason: (v) => (v === null ? null : text(500)(v)),
	labourMinutes: (v) => (typeof v === 'number' && Number.isFinite(v) && v >= 0 && v <= 24 * 60 ? v : undefined),
	failureMode: text(40),
	inspected: bool,
	unrepaired: bool
};

/**
 * Read a stored `data` text into a value that is always safe to handle: the parsed object, with
 * anything nested deeper than `MAX_JSON_DEPTH` levels replaced by a marker; for text that is not
 * a JSON object, an object holding only `UNREADABLE_KEY` with the first characters of the text.
 * Never throws.
 */
export function readStoredData(stored: unknown): Record<string, unknown> | null {
	if (stored === null || stored === undefined) return null;
	const raw = typeof stored === 'string' ? stored : String(stored);
	const unreadable = () => ({ [UNREADABLE_KEY]: clip(raw, SUMMARY_CHARS) });
	const parsed = parseStoredJson(raw, MAX_JSON_DEPTH);
	if (!parsed.ok) return unreadable();
	const value = parsed.value;
	if (value === null) return null;
	if (typeof value !== 'object' || Array.isArray(value)) return unreadable();
	// a plain object again (pruning leaves objects without a prototype)
	return Object.fromEntries(Object.entries(value));
}

/** The page's view of an event's data: known fields with their right types, and a summary of the rest. */
export function eventDataView(data: Record<string, unknown> | null | undefined): EventDataView | null {
	if (data === null || data === undefined) return null;
	const view: EventDataView = {};
	const rest: Record<string, unknown> = Object.create(null);
	let unreadable: string | null = null;
	for (const [key, value] of Object.entries(data)) {
		if (key === UNREADABLE_KEY && typeof value === 'string') {
			unreadable = value;
			continue;
		}
		const check = Object.hasOwn(KNOWN, key) ? KNOWN[key as keyof EventDataView] : undefined;
		const ok = check ? check(value) : undefined;
		if (ok === undefined) rest[key] = value;
		else (view as Record<string, unknown>)[key] = ok;
	}
	const parts: string[] = [];
	if (unreadable !== null) parts.push(unreadable);
	if (Object.keys(rest).length) parts.push(summariseValue(rest, SUMMARY_CHARS));
	if (parts.length) {
		view.unshown = clip(parts.join(' '), SUMMARY_CHARS);
		view.notice = STORED_DATA_NOTE;
	}
	return view;
}
