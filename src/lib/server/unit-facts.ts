/**
 * Facts the state machine's guards need that live outside the unit row. Each action may
 * have a loader; a later record (balance runs, assembly, quotes) adds its loader here.
 */
import { eq } from 'drizzle-orm';
import type { ActionName } from '../domain/units/actions';
import type { UnitFacts } from '../domain/units/guards';
import type { DbOrTx } from './db';
import { scrapReason, type Unit } from './db/schema';
import { hasAcceptedAssembly, hasPassingBalance } from './balance';
import { customerQuoteFacts } from './rebuild-facts';
import { inspectionFacts } from './checklists';

export type FactLoader = (tx: DbOrTx, unit: Unit) => Partial<UnitFacts>;

const scrapReasons: FactLoader = (tx) => ({
	scrapReasonCodes: tx
		.select({ code: scrapReason.code })
		.from(scrapReason)
		.where(eq(scrapReason.active, true))
		.all()
		.map((r) => r.code)
});

const balanceFacts: FactLoader = (tx, u) => ({ hasPassingBalance: hasPassingBalance(tx, u.id) });
const assemblyFacts: FactLoader = (tx, u) => ({ hasAssemblyRecord: hasAcceptedAssembly(tx, u.id) });

export const FACT_LOADERS: Partial<Record<ActionName, readonly FactLoader[]>> = {
	scrap: [scrapReasons],
	balance: [balanceFacts],
	assemble: [assemblyFacts],
	clean: [customerQuoteFacts],
	return: [customerQuoteFacts],
	accept: [inspectionFacts]
};

export function loadFacts(tx: DbOrTx, unitRow: Unit, action: ActionName): UnitFacts {
	const facts: UnitFacts = {};
	for (const load of FACT_LOADERS[action] ?? []) Object.assign(facts, load(tx, unitRow));
	return facts;
}
