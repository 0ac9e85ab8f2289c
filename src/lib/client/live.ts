/**
 * The browser side of live updates: one EventSource on `/api/stream`, with the connection
 * state reported so a board can fall back to polling while the stream is down.
 */
export interface LiveMessage {
	topic: string;
	kind: string;
	serial?: string;
	state?: string;
	stationCode?: string | null;
	at: string;
	[extra: string]: unknown;
}

export type LiveStatus = 'connecting' | 'open' | 'down';

export function connectLive(
	onMessage: (m: LiveMessage) => void,
	onStatus: (s: LiveStatus) => void = () => {},
	topics: readonly string[] = ['unit', 'lot', 'card', 'order', 'station', 'shipment']
): () => void {
	if (typeof EventSource === 'undefined') {
		onStatus('down');
		return () => {};
	}
	const source = new EventSource('/api/stream');
	onStatus('connecting');
	source.onopen = () => onStatus('open');
	source.onerror = () => onStatus(source.readyState === EventSource.CLOSED ? 'down' : 'connecting');
	const handler = (e: MessageEvent) => {
		try {
			onMessage(JSON.parse(e.data));
		} catch {
			/* ignore a malformed message */
		}
	};
	for (const t of topics) source.addEventListener(t, handler as EventListener);
	return () => source.close();
}
