/**
 * The station's queue of scans made without a link, kept in the browser's IndexedDB so a reload
 * or a flat battery loses nothing. Two lists: `waiting` (sent again when the link is back, on the
 * `online` event and every RETRY_MS while anything waits) and `needsYou` (refused when sent;
 * the tech dismisses or retries each). The send decisions live in `offline-queue.ts`.
 */
import { createStore, get, update, type UseStore } from 'idb-keyval';
import { replayQueue, type NeedsYou, type QueuedScan, type SendAnswer } from './offline-queue';

export const RETRY_MS = 10_000;
const WAITING = 'waiting';
const NEEDS_YOU = 'needs-you';

let store: UseStore | null = null;
function db(): UseStore {
	store ??= createStore('spoolyard', 'scan-queue');
	return store;
}

export const scanQueue = $state<{ waiting: QueuedScan[]; needsYou: NeedsYou[]; sending: boolean; error: string | null }>({
	waiting: [],
	needsYou: [],
	sending: false,
	error: null
});

async function load() {
	try {
		scanQueue.waiting = (await get<QueuedScan[]>(WAITING, db())) ?? [];
		scanQueue.needsYou = (await get<NeedsYou[]>(NEEDS_YOU, db())) ?? [];
		scanQueue.error = null;
	} catch {
		scanQueue.error = 'This browser cannot keep scans while offline (storage is off); scans made without a link are lost.';
	}
}

/** Keep one scan for later. Resolves false when the browser refuses to store it. */
export async function enqueueScan(item: QueuedScan): Promise<boolean> {
	try {
		await update<QueuedScan[]>(WAITING, (list = []) => (list.some((q) => q.key === item.key) ? list : [...list, item]), db());
		await load();
		return true;
	} catch {
		return false;
	}
}

async function settle(item: QueuedScan, into: NeedsYou | null) {
	await update<QueuedScan[]>(WAITING, (list = []) => list.filter((q) => q.key !== item.key), db());
	if (into) await update<NeedsYou[]>(NEEDS_YOU, (list = []) => [...list.filter((q) => q.key !== item.key), into], db());
}

type Sender = (item: QueuedScan) => Promise<SendAnswer>;
let running: Promise<void> | null = null;

/** Send what waits, oldest first; one run at a time. Resolves true when something was settled. */
export function flushQueue(send: Sender): Promise<boolean> {
	if (running) return running.then(() => false);
	let changed = false;
	running = (async () => {
		await load();
		if (scanQueue.waiting.length === 0) return;
		scanQueue.sending = true;
		try {
			await replayQueue($state.snapshot(scanQueue.waiting), send, async (item, v, answer) => {
				changed = true;
				await settle(item, v === 'attention' && answer.kind === 'http' ? { ...item, status: answer.status, message: answer.message } : null);
				await load();
			});
		} finally {
			scanQueue.sending = false;
			await load();
		}
	})().finally(() => (running = null));
	return running.then(() => changed);
}

/** Drop a refused scan: the tech has seen it and the unit stays where the server has it. */
export async function dismissNeedsYou(key: string) {
	await update<NeedsYou[]>(NEEDS_YOU, (list = []) => list.filter((q) => q.key !== key), db());
	await load();
}

/** Put a refused scan back in the queue with its key and send it again now. */
export async function retryNeedsYou(key: string, send: Sender): Promise<boolean> {
	const item = scanQueue.needsYou.find((q) => q.key === key);
	if (!item) return false;
	const back: QueuedScan = { key: item.key, serial: item.serial, stationCode: item.stationCode, at: item.at };
	await update<NeedsYou[]>(NEEDS_YOU, (list = []) => list.filter((q) => q.key !== key), db());
	await update<QueuedScan[]>(WAITING, (list = []) => [back, ...list.filter((q) => q.key !== key)], db());
	return flushQueue(send);
}

/**
 * Start watching for the link: loads the stored lists, sends at once when online, on every
 * `online` event and every RETRY_MS while scans wait. `onsettled` runs after a run that sent or
 * refused something (refetch the boards there). Returns the stop function.
 */
export function watchQueue(send: Sender, onsettled: () => void): () => void {
	const run = async () => {
		if (!navigator.onLine) return;
		if (await flushQueue(send)) onsettled();
	};
	void load().then(run);
	const onOnline = () => void run();
	window.addEventListener('online', onOnline);
	const t = setInterval(() => {
		if (scanQueue.waiting.length > 0) void run();
	}, RETRY_MS);
	return () => {
		window.removeEventListener('online', onOnline);
		clearInterval(t);
	};
}
