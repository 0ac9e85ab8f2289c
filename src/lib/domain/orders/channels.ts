/** Where orders come from, and the states an order is in. */

/** The four distributor depots, the web shop, and walk-ins / customers' own rebuilds. */
export const ORDER_CHANNELS = ['north', 'lakes', 'plains', 'coast', 'web', 'walk_in'] as const;
export type OrderChannel = (typeof ORDER_CHANNELS)[number];

export const CHANNEL_LABEL: Record<OrderChannel, string> = {
	north: 'North Depot',
	lakes: 'Lakes Depot',
	plains: 'Plains Depot',
	coast: 'Coast Depot',
	web: 'Web',
	walk_in: 'Walk-in / customer rebuild'
};

export const ORDER_STATUSES = ['open', 'fulfilled', 'cancelled'] as const;
export type OrderStatus = (typeof ORDER_STATUSES)[number];

export const STATUS_LABEL: Record<OrderStatus, string> = { open: 'Open', fulfilled: 'Fulfilled', cancelled: 'Cancelled' };

export function isChannel(value: unknown): value is OrderChannel {
	return typeof value === 'string' && (ORDER_CHANNELS as readonly string[]).includes(value);
}

/**
 * Read a channel as people write it in a file: the key ("north"), the label ("North Depot"),
 * or a short form ("North", "walk-in", "rebuild", "online"). Case and spacing do not matter.
 */
export function parseChannel(raw: string): OrderChannel | null {
	const s = raw.trim().toLowerCase().replace(/[\s_/-]+/g, ' ').trim();
	if (!s) return null;
	for (const c of ORDER_CHANNELS) {
		if (s === c.replace('_', ' ') || s === CHANNEL_LABEL[c].toLowerCase().replace(/[\s_/-]+/g, ' ')) return c;
	}
	const short: Record<string, OrderChannel> = {
		north: 'north',
		lakes: 'lakes',
		plains: 'plains',
		coast: 'coast',
		'north depot': 'north',
		'lakes depot': 'lakes',
		'plains depot': 'plains',
		'coast depot': 'coast',
		web: 'web',
		online: 'web',
		'web shop': 'web',
		walkin: 'walk_in',
		'walk in': 'walk_in',
		rebuild: 'walk_in',
		'customer rebuild': 'walk_in'
	};
	return short[s] ?? null;
}
