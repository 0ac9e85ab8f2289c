/** Settings for customer orders (shop name in e-mails, tax rate on quotes), with defaults. */
import { eq } from 'drizzle-orm';
import type { DbOrTx } from './db';
import { rebuildSetting } from './db/schema';

export interface RebuildSettings {
	shopName: string;
	/** Basis points: 825 = 8.25 %. */
	taxRateBp: number;
	currency: string;
}

const DEFAULTS: RebuildSettings = { shopName: process.env.SHOP_NAME ?? 'Spoolyard shop', taxRateBp: 0, currency: 'USD' };

export function getRebuildSettings(db: DbOrTx): RebuildSettings {
	const rows = db.select().from(rebuildSetting).all();
	const m = new Map(rows.map((r) => [r.key, r.value]));
	const tax = Number(m.get('taxRateBp'));
	return {
		shopName: m.get('shopName') || DEFAULTS.shopName,
		taxRateBp: Number.isInteger(tax) && tax >= 0 ? tax : DEFAULTS.taxRateBp,
		currency: m.get('currency') || DEFAULTS.currency
	};
}

export function setRebuildSetting(db: DbOrTx, key: keyof RebuildSettings, value: string): void {
	const existing = db.select().from(rebuildSetting).where(eq(rebuildSetting.key, key)).get();
	if (existing) db.update(rebuildSetting).set({ value }).where(eq(rebuildSetting.key, key)).run();
	else db.insert(rebuildSetting).values({ key, value }).run();
}

/** Where links in e-mails point: the public origin of the app. */
export function publicBaseUrl(): string {
	return (process.env.ORIGIN ?? `http://localhost:${process.env.PORT ?? 5173}`).replace(/\/$/, '');
}
