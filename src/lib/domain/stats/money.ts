/** Money in whole cents, and the labour cost of minutes at an hourly rate. */
import { nonNegative, nonNegativeInt, result } from '../numbers';

/** Cost in cents of `minutes` at `ratePerHourCents`, rounded to the cent (half away from zero). */
export function labourCents(minutes: number, ratePerHourCents: number): number {
	nonNegative('Labour minutes', minutes);
	nonNegative('The labour rate', ratePerHourCents);
	return result('The labour cost', Math.round((minutes * ratePerHourCents) / 60));
}

/** Cost per good core: what the lot cost divided by the cores accepted; null when none accepted. */
export function costPerGood(lotCostCents: number, accepted: number): number | null {
	nonNegative('The lot cost', lotCostCents);
	nonNegativeInt('Accepted cores', accepted);
	return accepted > 0 ? lotCostCents / accepted : null;
}

export function formatCents(cents: number | null | undefined): string {
	if (cents === null || cents === undefined || !Number.isFinite(cents)) return '—';
	return (cents / 100).toLocaleString('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
}
