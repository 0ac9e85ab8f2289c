/** Shop settings the reports use: the labour rate for the time spent before a scrap verdict. */
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import type { DbOrTx } from '../db';
import { shopSetting } from '../db/schema';

export const LABOUR_RATE_KEY = 'labour_rate_cents_per_hour';

export const labourRateSchema = z.object({
	ratePerHour: z.coerce
		.number({ error: 'Give the labour rate as a number.' })
		.min(0, 'The labour rate cannot be negative.')
		.max(100_000, 'That labour rate is not plausible (over 100,000 an hour).')
});

/** Cents per hour; 0 until the owner sets it. */
export function labourRateCents(db: DbOrTx): number {
	const row = db.select().from(shopSetting).where(eq(shopSetting.key, LABOUR_RATE_KEY)).get();
	const n = row ? Number(row.value) : 0;
	return Number.isFinite(n) && n >= 0 ? Math.round(n) : 0;
}

export function setLabourRateCents(db: DbOrTx, cents: number, now = new Date()): void {
	db.insert(shopSetting)
		.values({ key: LABOUR_RATE_KEY, value: String(Math.round(cents)), updatedAt: now })
		.onConflictDoUpdate({ target: shopSetting.key, set: { value: String(Math.round(cents)), updatedAt: now } })
		.run();
}
