/** Shop settings the reports use: the labour rate for the time spent before a scrap verdict. */
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import type { DbOrTx } from '../db';
import { shopSetting } from '../db/schema';
import { requiredNumber } from '../../domain/input/fields';

export const LABOUR_RATE_KEY = 'labour_rate_cents_per_hour';

export const labourRateSchema = z.object({
	// a blank rate is refused (not set to 0); "0" typed on purpose is a rate
	ratePerHour: requiredNumber('Labour rate', {
		blank: 'Give the labour rate per hour (0 if labour should not be costed).',
		notNumber: 'Give the labour rate as a number.',
		min: 0,
		max: 100_000,
		range: 'The labour rate is from 0 to 100,000 an hour.'
	})
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
