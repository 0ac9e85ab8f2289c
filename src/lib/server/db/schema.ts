/**
 * Spoolyard's tables. Singular table names, snake_case columns, camelCase keys.
 * Times are stored as integer milliseconds since the epoch unless the column says otherwise.
 */
import { sql } from 'drizzle-orm';
import { index, integer, real, sqliteTable, text, uniqueIndex, type AnySQLiteColumn } from 'drizzle-orm/sqlite-core';
import { ROLES } from '../../domain/auth/roles';
import { STAGES, UNIT_STATES } from '../../domain/units/states';
import { ACTIONS } from '../../domain/units/actions';

const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

export const user = sqliteTable('user', {
	id: text('id').primaryKey(),
	email: text('email').notNull().unique(),
	name: text('name').notNull(),
	role: text('role', { enum: ROLES }).notNull(),
	active: integer('active', { mode: 'boolean' }).notNull().default(true),
	passwordHash: text('password_hash').notNull(),
	createdAt: createdAt()
});

export const session = sqliteTable(
	'session',
	{
		id: text('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		/** Seconds since the epoch, as the session library stores it. */
		expiresAt: integer('expires_at').notNull()
	},
	(t) => [index('session_user_idx').on(t.userId)]
);

export const station = sqliteTable('station', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	code: text('code').notNull().unique(),
	name: text('name').notNull(),
	stage: text('stage', { enum: STAGES }).notNull(),
	/** Lathes keep aluminium and cast-iron work apart; null where it does not matter. */
	material: text('material', { enum: ['aluminium', 'cast_iron'] }),
	/** Hours a unit may wait for this station before the board marks it overdue. */
	overdueHours: real('overdue_hours').notNull().default(24),
	sortOrder: integer('sort_order').notNull().default(0),
	active: integer('active', { mode: 'boolean' }).notNull().default(true)
});

export const turboModel = sqliteTable('turbo_model', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	/** The shop's own part number. */
	code: text('code').notNull().unique(),
	family: text('family').notNull(),
	description: text('description').notNull().default(''),
	active: integer('active', { mode: 'boolean' }).notNull().default(true)
});

export const supplier = sqliteTable('supplier', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	name: text('name').notNull().unique(),
	notes: text('notes').notNull().default(''),
	active: integer('active', { mode: 'boolean' }).notNull().default(true)
});

export const LOT_SOURCES = ['purchased_skid', 'customer_return', 'warranty_return'] as const;
export type LotSource = (typeof LOT_SOURCES)[number];

export const coreLot = sqliteTable(
	'core_lot',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		code: text('code').notNull().unique(),
		source: text('source', { enum: LOT_SOURCES }).notNull(),
		supplierId: integer('supplier_id').references(() => supplier.id, { onDelete: 'restrict' }),
		/** Calendar date the lot arrived, YYYY-MM-DD. */
		receivedOn: text('received_on').notNull(),
		/** Price paid per core, in cents. */
		costPerCoreCents: integer('cost_per_core_cents').notNull().default(0),
		expectedCount: integer('expected_count').notNull().default(0),
		notes: text('notes').notNull().default(''),
		createdAt: createdAt()
	},
	(t) => [index('core_lot_supplier_idx').on(t.supplierId), index('core_lot_received_idx').on(t.receivedOn)]
);

export const unit = sqliteTable(
	'unit',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		/** The shop serial printed on the traveler, SY- and five digits. */
		serial: text('serial').notNull().unique(),
		/** The tag as found on the core; free text. */
		originalTag: text('original_tag').notNull().default(''),
		lotId: integer('lot_id')
			.notNull()
			.references(() => coreLot.id, { onDelete: 'restrict' }),
		modelId: integer('model_id')
			.notNull()
			.references(() => turboModel.id, { onDelete: 'restrict' }),
		state: text('state', { enum: UNIT_STATES }).notNull().default('received'),
		held: integer('held', { mode: 'boolean' }).notNull().default(false),
		holdReason: text('hold_reason'),
		priority: integer('priority').notNull().default(0),
		/** Optimistic lock: bumped by every event. */
		version: integer('version').notNull().default(1),
		/** When the unit entered its current state (for the age shown on boards). */
		stateSince: integer('state_since', { mode: 'timestamp_ms' }).notNull(),
		notes: text('notes').notNull().default(''),
		createdAt: createdAt(),
		updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
		/** A warranty return points at the unit it is a return of (the serial that was shipped). */
		returnOfUnitId: integer('return_of_unit_id').references((): AnySQLiteColumn => unit.id, { onDelete: 'restrict' })
	},
	(t) => [
		index('unit_board_idx').on(t.state, t.held, t.priority, t.stateSince),
		index('unit_lot_idx').on(t.lotId, t.state),
		index('unit_model_idx').on(t.modelId, t.state),
		index('unit_tag_idx').on(t.originalTag),
		index('unit_lot_model_state_idx').on(t.lotId, t.modelId, t.state)
	]
);

export const unitEvent = sqliteTable(
	'unit_event',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		unitId: integer('unit_id')
			.notNull()
			.references(() => unit.id, { onDelete: 'restrict' }),
		/** 1, 2, 3... within the unit; the order the history is read in. */
		seq: integer('seq').notNull(),
		fromState: text('from_state', { enum: UNIT_STATES }),
		toState: text('to_state', { enum: UNIT_STATES }).notNull(),
		action: text('action', { enum: [...ACTIONS, 'undo'] }).notNull(),
		stationId: integer('station_id').references(() => station.id, { onDelete: 'restrict' }),
		userId: text('user_id').references(() => user.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		idempotencyKey: text('idempotency_key').notNull().unique(),
		note: text('note'),
		/** JSON: the move's data (verdict, scrap reason, hold reason, ...). */
		data: text('data', { mode: 'json' }).$type<Record<string, unknown>>()
	},
	(t) => [
		uniqueIndex('unit_event_unit_seq_idx').on(t.unitId, t.seq),
		index('unit_event_station_at_idx').on(t.stationId, t.at),
		index('unit_event_at_idx').on(t.at),
		index('unit_event_user_at_idx').on(t.userId, t.at),
		index('unit_event_action_unit_idx').on(t.action, t.unitId)
	]
);

export const scrapReason = sqliteTable('scrap_reason', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	code: text('code').notNull().unique(),
	label: text('label').notNull(),
	category: text('category').notNull(),
	active: integer('active', { mode: 'boolean' }).notNull().default(true)
});

export type User = typeof user.$inferSelect;
export type Station = typeof station.$inferSelect;
export type TurboModel = typeof turboModel.$inferSelect;
export type Supplier = typeof supplier.$inferSelect;
export type CoreLot = typeof coreLot.$inferSelect;
export type Unit = typeof unit.$inferSelect;
export type UnitEvent = typeof unitEvent.$inferSelect;
export type ScrapReason = typeof scrapReason.$inferSelect;

/** Named counters handed out inside transactions (e.g. the next shop serial number). */
export const counter = sqliteTable('counter', {
	name: text('name').primaryKey(),
	value: integer('value').notNull()
});

// ── Owner's reports: shop settings and report indexes ──────────────────────────────────────

/** Shop-wide settings, one row per key (e.g. `labour_rate_cents_per_hour`). */
export const shopSetting = sqliteTable('shop_setting', {
	key: text('key').primaryKey(),
	value: text('value').notNull(),
	updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull()
});
