/**
 * Scans made while the station has no link to the server wait here, in order, and are sent
 * again later with the key they were made with, so a scan the server already holds is answered
 * as a replay and never counted twice. Pure: no browser, no storage; the station keeps the lists
 * (`scan-queue.svelte.ts`) and hands them to `replayQueue` with a function that sends one scan.
 */

/** One scan made without a link: the key is the one the server will see. */
export interface QueuedScan {
	key: string;
	serial: string;
	stationCode: string;
	/** When the tech scanned it (ISO time). */
	at: string;
}

/** A queued scan the server refused when it was sent; the tech decides what happens to it. */
export interface NeedsYou extends QueuedScan {
	status: number;
	/** The server's own sentence. */
	message: string;
}

/** What one attempt at sending a queued scan came to. */
export type SendAnswer = { kind: 'network' } | { kind: 'http'; status: number; message: string };

export type Verdict = 'sent' | 'keep' | 'attention';

/**
 * What to do with a scan after one attempt: 2xx is sent (a replayed answer counts, the server
 * already had it); no answer, a server fault (5xx) or a lapsed sign-in (401) keeps it waiting and
 * stops the run, so later scans do not overtake it; any other refusal (409 the unit moved on,
 * 400/403/404/422) needs the tech.
 */
export function verdict(a: SendAnswer): Verdict {
	if (a.kind === 'network') return 'keep';
	if (a.status >= 200 && a.status < 300) return 'sent';
	if (a.status === 401 || a.status >= 500 || a.status === 408 || a.status === 429) return 'keep';
	if (a.status >= 400) return 'attention';
	return 'keep';
}

export interface ReplayResult {
	sent: QueuedScan[];
	kept: QueuedScan[];
	attention: NeedsYou[];
}

/**
 * Send the queue oldest first, one at a time. The first scan that must keep waiting stops the
 * run: it and every scan after it stay queued in their order. `settled` is told about each scan
 * as soon as its fate is known, so the stored lists can follow along.
 */
export async function replayQueue(
	queue: readonly QueuedScan[],
	send: (item: QueuedScan) => Promise<SendAnswer>,
	settled?: (item: QueuedScan, v: Exclude<Verdict, 'keep'>, answer: SendAnswer) => void | Promise<void>
): Promise<ReplayResult> {
	const ordered = [...queue].sort((a, b) => (a.at < b.at ? -1 : a.at > b.at ? 1 : 0));
	const out: ReplayResult = { sent: [], kept: [], attention: [] };
	for (let i = 0; i < ordered.length; i++) {
		const item = ordered[i];
		let answer: SendAnswer;
		try {
			answer = await send(item);
		} catch {
			answer = { kind: 'network' };
		}
		const v = verdict(answer);
		if (v === 'keep') {
			out.kept.push(...ordered.slice(i));
			break;
		}
		if (v === 'sent') out.sent.push(item);
		else if (answer.kind === 'http') out.attention.push({ ...item, status: answer.status, message: answer.message });
		await settled?.(item, v, answer);
	}
	return out;
}

/** "❚❚ 3 scans waiting to send" — the words the board shows for the queue. */
export function waitingWords(n: number): string {
	return n === 1 ? '1 scan waiting to send' : `${n} scans waiting to send`;
}
