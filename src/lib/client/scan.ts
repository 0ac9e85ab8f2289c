/**
 * Everything a station screen sends to the server goes through here: scans, verdict and hold
 * moves, undo and the teardown qualification with photos. One module, one result shape, so a
 * queue for scans made while offline can be put in front of `send` later without touching the
 * screens.
 */
import { newKey } from '$lib/ids';
import { MAX_PHOTO_BYTES, MAX_PHOTOS } from '$lib/domain/photos/image-type';
import type { QueuedScan, SendAnswer } from './offline-queue';
import { enqueueScan } from './scan-queue.svelte';

export type ScanOutcome =
	| { ok: true; serial: string; to: string; held: boolean; replayed: boolean; seq: number | null; action: string; undo?: boolean }
	| { ok: false; serial: string | null; message: string; fields?: Record<string, string[]>; queued?: false }
	/** No link: the scan waits in this browser and is sent with the same key when the link is back. */
	| { ok: false; serial: string; message: string; queued: true; fields?: undefined };

interface Sent {
	status: number;
	body: Record<string, unknown>;
}

async function send(url: string, init: RequestInit): Promise<Sent | { network: true }> {
	try {
		const res = await fetch(url, { ...init, credentials: 'same-origin' });
		let body: Record<string, unknown> = {};
		try {
			body = await res.json();
		} catch {
			/* not JSON (e.g. a proxy page) */
		}
		return { status: res.status, body };
	} catch {
		return { network: true };
	}
}

function toOutcome(serial: string | null, r: Sent | { network: true }): ScanOutcome {
	if ('network' in r) return { ok: false, serial, message: 'No connection to the server; nothing was saved. Scan again when the link is back.' };
	const b = r.body as {
		unit?: { serial: string; state: string; held: boolean };
		event?: { seq: number; action: string };
		replayed?: boolean;
		undoneSeq?: number;
		error?: { message: string; fields?: Record<string, string[]> };
	};
	if (r.status >= 200 && r.status < 300 && b.unit) {
		return {
			ok: true,
			serial: b.unit.serial,
			to: b.unit.state,
			held: b.unit.held,
			replayed: !!b.replayed,
			seq: b.event?.seq ?? null,
			action: b.event?.action ?? (b.undoneSeq ? 'undo' : ''),
			undo: b.undoneSeq !== undefined
		};
	}
	if (r.status === 413) return { ok: false, serial, message: 'That is too much to send at once; send fewer or smaller photos.' };
	return { ok: false, serial, message: b.error?.message ?? `The server refused it (${r.status}).`, fields: b.error?.fields };
}

const SERIAL = /^SY-?\d{5}$/i;

/** Tidy what a scanner or a person typed into a serial (SY-00421); null when it is not one. */
export function cleanSerial(raw: string): string | null {
	const t = raw.trim().toUpperCase().replace(/\s+/g, '');
	if (!SERIAL.test(t)) return null;
	return t.includes('-') ? t : `SY-${t.slice(2)}`;
}

/** One scan at a station: the server makes the station's main move for the unit. */
export async function submitScan(stationCode: string, raw: string): Promise<ScanOutcome> {
	const serial = cleanSerial(raw);
	if (!serial) return { ok: false, serial: null, message: `"${raw.trim().slice(0, 40)}" is not a shop serial (SY- and five digits).` };
	const item: QueuedScan = { key: newKey('scan'), serial, stationCode, at: new Date().toISOString() };
	const offline = typeof navigator !== 'undefined' && navigator.onLine === false;
	const r = offline ? ({ network: true } as const) : await postScan(item);
	if ('network' in r) {
		if (await enqueueScan(item)) {
			return { ok: false, serial, queued: true, message: 'No connection to the server. The scan is kept on this screen and is sent by itself when the link is back.' };
		}
	}
	return toOutcome(serial, r);
}

function postScan(item: QueuedScan) {
	return send(`/api/units/${item.serial}/events`, {
		method: 'POST',
		headers: { 'content-type': 'application/json', 'x-spoolyard-scan': '1' },
		body: JSON.stringify({ scan: true, stationCode: item.stationCode, idempotencyKey: item.key })
	});
}

/** Send one queued scan again, with the key it was made with. */
export async function sendQueuedScan(item: QueuedScan): Promise<SendAnswer> {
	const r = await postScan(item);
	if ('network' in r) return { kind: 'network' };
	const o = toOutcome(item.serial, r);
	return { kind: 'http', status: r.status, message: o.ok ? '' : o.message };
}

/** A named move (accept, scrap, hold, release, rework) made at a station. */
export async function submitMove(stationCode: string | null, serial: string, action: string, data: Record<string, unknown> = {}, note?: string): Promise<ScanOutcome> {
	const r = await send(`/api/units/${serial}/events`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({ action, stationCode, idempotencyKey: newKey('move'), data, note: note || null })
	});
	return toOutcome(serial, r);
}

/** Undo the caller's own last move on a unit; `seq` is the move the screen showed. */
export async function submitUndo(stationCode: string | null, serial: string, seq?: number | null): Promise<ScanOutcome> {
	const r = await send(`/api/units/${serial}/undo`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify({ stationCode, idempotencyKey: newKey('undo'), ...(seq ? { seq } : {}) })
	});
	return toOutcome(serial, r);
}

/** Checks the browser can make before sending photos (the server checks the bytes again). */
export function precheckPhotos(files: readonly File[]): string | null {
	if (files.length > MAX_PHOTOS) return `At most ${MAX_PHOTOS} photos per qualification.`;
	for (const f of files) {
		if (f.size > MAX_PHOTO_BYTES) return `${f.name} is ${(f.size / 1024 / 1024).toFixed(1)} MB; photos may be at most ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`;
	}
	return null;
}

/** The teardown qualification: answers, verdict and photos in one request. */
export async function submitQualification(stationCode: string, serial: string, form: FormData): Promise<ScanOutcome> {
	const files = form.getAll('photos').filter((f): f is File => typeof f !== 'string' && f.size > 0);
	const bad = precheckPhotos(files);
	if (bad) return { ok: false, serial, message: bad };
	form.set('stationCode', stationCode);
	form.set('idempotencyKey', newKey('qualify'));
	const r = await send(`/api/units/${serial}/inspection`, { method: 'POST', body: form });
	return toOutcome(serial, r);
}
