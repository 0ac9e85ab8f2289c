/**
 * Spoolyard's tables. Singular table names, snake_case columns, camelCase keys.
 * Times are stored as integer milliseconds since the epoch unless the column says otherwise.
 */
import { sql } from 'drizzle-orm';
import { index, integer, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { ROLES } from '../../domain/auth/roles';
import { STAGES, UNIT_STATES } from '../../domain/units/states';
import { ACTIONS } from '../../domain/units/actions';
import { CARD_STYLE_KEYS } from '../../domain/cards/card-style';
import { ORDER_CHANNELS, ORDER_STATUSES } from '../../domain/orders/channels';

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
		updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [
		index('unit_board_idx').on(t.state, t.held, t.priority, t.stateSince),
		index('unit_lot_idx').on(t.lotId, t.state),
		index('unit_model_idx').on(t.modelId, t.state),
		index('unit_tag_idx').on(t.originalTag)
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
		index('unit_event_user_at_idx').on(t.userId, t.at)
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

// ---------------------------------------------------------------------------
// The lead's board: priority cards, orders and demand, build-plan settings.
// ---------------------------------------------------------------------------

export const CARD_KINDS = ['units', 'rule'] as const;

/** A priority card: orders every station's queue by its rank. Either a set of units or a rule. */
export const priorityCard = sqliteTable(
	'priority_card',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		title: text('title').notNull(),
		/** Calendar date, YYYY-MM-DD. */
		dueOn: text('due_on'),
		/** 1 is the top of the board. Open cards keep distinct ranks. */
		rank: integer('rank').notNull(),
		style: text('style', { enum: CARD_STYLE_KEYS }).notNull().default('plain'),
		kind: text('kind', { enum: CARD_KINDS }).notNull(),
		/** Rule cards: any of model, stage and lot; a unit matches when every set part matches. */
		ruleModelId: integer('rule_model_id').references(() => turboModel.id, { onDelete: 'restrict' }),
		ruleStage: text('rule_stage', { enum: STAGES }),
		ruleLotId: integer('rule_lot_id').references(() => coreLot.id, { onDelete: 'restrict' }),
		open: integer('open', { mode: 'boolean' }).notNull().default(true),
		/** Optimistic lock: bumped by every change to the card. */
		version: integer('version').notNull().default(1),
		createdBy: text('created_by').references(() => user.id, { onDelete: 'restrict' }),
		createdAt: createdAt(),
		updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
		updatedBy: text('updated_by').references(() => user.id, { onDelete: 'restrict' }),
		closedAt: integer('closed_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('priority_card_open_rank_idx').on(t.open, t.rank)]
);

/** Units on a units card. A unit is on at most one such card; moving it replaces the row. */
export const priorityCardUnit = sqliteTable(
	'priority_card_unit',
	{
		unitId: integer('unit_id')
			.primaryKey()
			.references(() => unit.id, { onDelete: 'cascade' }),
		cardId: integer('card_id')
			.notNull()
			.references(() => priorityCard.id, { onDelete: 'cascade' }),
		addedAt: integer('added_at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('priority_card_unit_card_idx').on(t.cardId)]
);

/** Append-only log of every change to a card: who, when, what. */
export const priorityCardChange = sqliteTable(
	'priority_card_change',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		cardId: integer('card_id')
			.notNull()
			.references(() => priorityCard.id, { onDelete: 'restrict' }),
		userId: text('user_id').references(() => user.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		/** created, edited, closed, reopened, reordered, units_added, units_moved_in, units_moved_out */
		kind: text('kind').notNull(),
		/** JSON: what changed (before/after values, serials, ranks). */
		detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>()
	},
	(t) => [index('priority_card_change_card_idx').on(t.cardId, t.at)]
);


/** A customer order: a channel, a due date and lines of model × quantity. */
export const customerOrder = sqliteTable(
	'customer_order',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		/** The order's reference as the office or the customer writes it; unique. */
		ref: text('ref').notNull().unique(),
		channel: text('channel', { enum: ORDER_CHANNELS }).notNull(),
		customer: text('customer').notNull().default(''),
		/** Calendar dates, YYYY-MM-DD. */
		orderedOn: text('ordered_on').notNull(),
		dueOn: text('due_on'),
		status: text('status', { enum: ORDER_STATUSES }).notNull().default('open'),
		notes: text('notes').notNull().default(''),
		createdBy: text('created_by').references(() => user.id, { onDelete: 'restrict' }),
		createdAt: createdAt()
	},
	(t) => [index('customer_order_status_due_idx').on(t.status, t.dueOn), index('customer_order_ordered_idx').on(t.orderedOn)]
);

export const orderLine = sqliteTable(
	'order_line',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		orderId: integer('order_id')
			.notNull()
			.references(() => customerOrder.id, { onDelete: 'cascade' }),
		modelId: integer('model_id')
			.notNull()
			.references(() => turboModel.id, { onDelete: 'restrict' }),
		quantity: integer('quantity').notNull()
	},
	(t) => [index('order_line_order_idx').on(t.orderId), index('order_line_model_idx').on(t.modelId)]
);

/** Shop-wide planning settings by name (e.g. the smoothing constant). */
export const planSetting = sqliteTable('plan_setting', {
	name: text('name').primaryKey(),
	value: real('value').notNull(),
	updatedBy: text('updated_by').references(() => user.id, { onDelete: 'restrict' }),
	updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull()
});

export type PriorityCard = typeof priorityCard.$inferSelect;
export type CustomerOrder = typeof customerOrder.$inferSelect;
