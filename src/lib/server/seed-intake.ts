/** Demo touches for lot intake: the newest skid is still being unpacked, so some cores are still to come. */
import { desc, eq } from 'drizzle-orm';
import type { Tx } from './db';
import { coreLot } from './db/schema';

export function seedIntakeDemo(tx: Tx): void {
	const newest = tx.select().from(coreLot).where(eq(coreLot.source, 'purchased_skid')).orderBy(desc(coreLot.receivedOn), desc(coreLot.id)).limit(1).get();
	if (!newest) return;
	tx.update(coreLot)
		.set({ expectedCount: newest.expectedCount + 6, notes: `${newest.notes} Still unpacking: 6 cores to come.`.trim() })
		.where(eq(coreLot.id, newest.id))
		.run();
}
