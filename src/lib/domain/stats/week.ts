/** Weeks start on Monday (ISO 8601); a week is named by the UTC date of its Monday, YYYY-MM-DD. */
export function weekStart(atMs: number): string {
	const d = new Date(atMs);
	const day = (d.getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
	const monday = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate() - day);
	return new Date(monday).toISOString().slice(0, 10);
}
