/**
 * Boards stay current through the live stream: every `unit` or `card` message invalidates the
 * board queries (and the open qualification), so a scan on one screen shows on every other
 * board at once. While the stream is not open, boards poll instead (`pollMs`).
 */
import type { QueryClient } from '@tanstack/svelte-query';
import { untrack } from 'svelte';
import { connectLive, type LiveStatus } from './live';

export const POLL_MS = 5_000;

export interface LiveLink {
	status: LiveStatus;
	/** Server time of the last change heard. */
	last: string | null;
	/** How often boards poll right now; false while the stream is open. */
	readonly pollMs: number | false;
}

/** Call during a component's setup: opens the stream for as long as the component lives. */
export function createLiveLink(client: QueryClient): LiveLink {
	const link = $state<{ status: LiveStatus; last: string | null }>({ status: 'connecting', last: null });
	$effect(() =>
		// untracked: the status callbacks read and write `link`, which must not restart the stream
		untrack(() =>
			connectLive(
			(m) => {
				if (m.topic !== 'unit' && m.topic !== 'card') return;
				link.last = m.at;
				void client.invalidateQueries({ queryKey: ['board'] });
				void client.invalidateQueries({ queryKey: ['qualify'] });
			},
			(s) => {
				const wasOpen = link.status === 'open';
				link.status = s;
				// back from a gap: fetch what was missed while the stream was down
				if (s === 'open' && !wasOpen) void client.invalidateQueries({ queryKey: ['board'] });
			},
			['unit', 'card']
			)
		)
	);
	return {
		get status() {
			return link.status;
		},
		get last() {
			return link.last;
		},
		get pollMs() {
			return link.status === 'open' ? false : POLL_MS;
		}
	};
}

export async function fetchBoard(code: string) {
	const res = await fetch(`/api/stations/${encodeURIComponent(code)}/board`, { credentials: 'same-origin' });
	if (!res.ok) throw new Error(`The board could not be loaded (${res.status}).`);
	return res.json();
}
