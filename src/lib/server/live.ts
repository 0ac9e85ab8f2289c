/**
 * Live updates: services publish what changed after their transaction commits; the
 * `/api/stream` route forwards it to every open board as server-sent events.
 *
 * This is the one piece of in-process shared state the server keeps, on purpose: the set of
 * open streams. It holds no data of the shop; a restart loses nothing but open connections,
 * and clients reconnect and refetch.
 */

export type LiveTopic = 'unit' | 'lot' | 'card' | 'order' | 'station' | 'shipment';

export interface LiveEvent {
	topic: LiveTopic;
	/** What happened, e.g. the action name for a unit move. */
	kind: string;
	/** The unit's serial, for unit events. */
	serial?: string;
	/** The state the unit is in now, for unit events. */
	state?: string;
	/** The station the change happened at, when there was one. */
	stationCode?: string | null;
	/** Server time the change was committed, ISO 8601. */
	at: string;
	[extra: string]: unknown;
}

type Listener = (event: LiveEvent) => void;

const listeners = new Set<Listener>();

export function publish(event: LiveEvent): void {
	for (const listener of listeners) {
		try {
			listener(event);
		} catch {
			// a broken stream must not stop the others
		}
	}
}

export function subscribe(listener: Listener): () => void {
	listeners.add(listener);
	return () => listeners.delete(listener);
}

export function listenerCount(): number {
	return listeners.size;
}
