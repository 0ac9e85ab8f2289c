/** How the reports write numbers: percentages with one decimal, intervals, money, days. */
export function pct(x: number | null | undefined, digits = 1): string {
	return x === null || x === undefined || !Number.isFinite(x) ? '—' : `${(x * 100).toFixed(digits)} %`;
}

export function ci(low: number | null | undefined, high: number | null | undefined): string {
	return low === null || low === undefined || high === null || high === undefined ? '—' : `${(low * 100).toFixed(1)}–${(high * 100).toFixed(1)} %`;
}

export function money(cents: number | null | undefined): string {
	if (cents === null || cents === undefined || !Number.isFinite(cents)) return '—';
	return (cents / 100).toLocaleString('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
}

export function daysText(d: number | null | undefined): string {
	return d === null || d === undefined || !Number.isFinite(d) ? '—' : `${d.toFixed(1)} d`;
}

/** Fetch one of our JSON report routes; throws the server's sentence on an error. */
/** The report filters of a page's address (from, to, model) as a query string for the report APIs. */
export function reportFilters(url: URL, keys: readonly string[] = ['from', 'to', 'model']): string {
	const p = new URLSearchParams();
	for (const k of keys) {
		const v = url.searchParams.get(k);
		if (v) p.set(k, v);
	}
	return p.toString();
}

export async function fetchReport<T>(path: string, fetcher: typeof fetch = fetch): Promise<T> {
	const res = await fetcher(path, { headers: { accept: 'application/json' } });
	const body = await res.json().catch(() => null);
	if (!res.ok) throw new Error(body?.error?.message ?? `The report could not be loaded (${res.status}).`);
	return body as T;
}

/** Colour-blind-safe palette (Okabe & Ito 2008, "Color Universal Design"). */
export const PALETTE = {
	blue: '#0072B2',
	orange: '#E69F00',
	vermillion: '#D55E00',
	green: '#009E73',
	sky: '#56B4E9',
	purple: '#CC79A7',
	yellow: '#F0E442',
	black: '#000000'
} as const;
export const SERIES_COLOURS = [PALETTE.blue, PALETTE.orange, PALETTE.green, PALETTE.vermillion, PALETTE.sky, PALETTE.purple, PALETTE.yellow, PALETTE.black];
