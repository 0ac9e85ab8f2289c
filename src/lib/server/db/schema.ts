/**
 * Spoolyard's tables. Singular table names, snake_case columns, camelCase keys.
 * Times are stored as integer milliseconds since the epoch unless the column says otherwise.
 */
import { sql } from 'drizzle-orm';
import { customType, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex, type AnySQLiteColumn } from 'drizzle-orm/sqlite-core';
import { ROLES } from '../../domain/auth/roles';
import { STAGES, UNIT_STATES } from '../../domain/units/states';
import { ACTIONS } from '../../domain/units/actions';
import { readStoredData } from '../../domain/units/event-data';
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
		updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
		/** A warranty return points at the unit it is a return of (the serial that was shipped). */
		returnOfUnitId: integer('return_of_unit_id').references((): AnySQLiteColumn => unit.id, { onDelete: 'restrict' }),
		/**
		 * Kept by database triggers from the unit's history (never written by the services): the
		 * minutes recorded on its inspect / accept / scrap entries, and the reason of its latest
		 * scrap entry ('(none)' when that entry gave none; null when it was never scrapped).
		 */
		verdictLabourMinutes: real('verdict_labour_minutes').notNull().default(0),
		scrapReasonCode: text('scrap_reason_code'),
		/** Kept by a trigger: the station of the unit's latest history entry (what "in work here" reads). */
		lastStationId: integer('last_station_id').references((): AnySQLiteColumn => station.id, { onDelete: 'set null' })
	},
	(t) => [
		index('unit_board_idx').on(t.state, t.held, t.priority, t.stateSince),
		index('unit_lot_idx').on(t.lotId, t.state),
		index('unit_model_idx').on(t.modelId, t.state),
		index('unit_tag_idx').on(t.originalTag),
		index('unit_lot_model_state_idx').on(t.lotId, t.modelId, t.state),
		/** A station's queue without a card: the oldest first, read in index order. */
		index('unit_queue_idx').on(t.state, t.stateSince),
		index('unit_last_station_idx').on(t.lastStationId, t.state, t.updatedAt)
	]
);

/**
 * Per lot and model: how many units, how many still wait for their verdict, how many are
 * scrapped and the verdict labour on those. Kept by triggers on `unit` in the same transaction
 * as every change (drizzle/0010 and 0011), so the scrap report reads a few thousand rows instead
 * of the whole history. tests/integration/lot-tally.test.ts checks it against a recount.
 */
export const lotTally = sqliteTable(
	'lot_tally',
	{
		lotId: integer('lot_id')
			.notNull()
			.references(() => coreLot.id, { onDelete: 'cascade' }),
		modelId: integer('model_id')
			.notNull()
			.references(() => turboModel.id, { onDelete: 'cascade' }),
		received: integer('received').notNull().default(0),
		waiting: integer('waiting').notNull().default(0),
		scrapped: integer('scrapped').notNull().default(0),
		scrapLabourMinutes: real('scrap_labour_minutes').notNull().default(0)
	},
	(t) => [
		primaryKey({ columns: [t.lotId, t.modelId] }),
		// the scrap report's per-model sums read this in model order, without sorting
		index('lot_tally_model_idx').on(t.modelId, t.lotId, t.received, t.waiting, t.scrapped, t.scrapLabourMinutes)
	]
);

/** Units per state, kept by triggers on `unit` (drizzle/0013): a queue's length without counting it. */
export const stateTally = sqliteTable('state_tally', {
	state: text('state', { enum: UNIT_STATES }).primaryKey(),
	units: integer('units').notNull().default(0)
});

/** Scrapped units per lot, model and scrap reason (the reason of each unit's latest scrap entry). */
export const lotScrapReasonTally = sqliteTable(
	'lot_scrap_reason_tally',
	{
		lotId: integer('lot_id')
			.notNull()
			.references(() => coreLot.id, { onDelete: 'cascade' }),
		modelId: integer('model_id')
			.notNull()
			.references(() => turboModel.id, { onDelete: 'cascade' }),
		reasonCode: text('reason_code').notNull(),
		units: integer('units').notNull().default(0)
	},
	(t) => [
		primaryKey({ columns: [t.lotId, t.modelId, t.reasonCode] }),
		// the scrap report's reasons per lot read this in (lot, reason) order, without sorting
		index('lot_scrap_reason_tally_reason_idx').on(t.lotId, t.reasonCode, t.units)
	]
);

/**
 * A JSON object in a text column, read without ever throwing: text that is not a JSON object, or
 * nests too deep, comes back as `{ '~unreadable': '<first characters>' }` (see `readStoredData`),
 * so a row left by any version of the app cannot break the pages that read it.
 */
const storedJson = customType<{ data: Record<string, unknown>; driverData: string }>({
	dataType: () => 'text',
	toDriver: (value) => JSON.stringify(value),
	fromDriver: (value) => readStoredData(value) ?? {}
});

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
		data: storedJson('data')
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

// ---------------------------------------------------------------------------------------
// Balancing and assembly: the model's spec, balance runs and the assembly record of a unit.
// ---------------------------------------------------------------------------------------
import { ALLOCATION_METHODS, CORRECTION_MODES, RUN_KINDS, PLANE_KEYS, type SpecSources } from '../../domain/balance/spec';
import { UNBALANCE_UNITS } from '../../domain/balance/tolerance';

/** Per turbo model: the numbers balancing and assembly are checked against. */
export const modelSpec = sqliteTable('model_spec', {
	modelId: integer('model_id')
		.primaryKey()
		.references(() => turboModel.id, { onDelete: 'cascade' }),
	rotorMassKg: real('rotor_mass_kg').notNull(),
	maxServiceRpm: integer('max_service_rpm').notNull(),
	/** Balance quality grade G (mm/s) the shop balances to before its tightening factor. */
	gradeG: real('grade_g').notNull(),
	tighteningFactor: real('tightening_factor').notNull().default(1),
	allocation: text('allocation', { enum: ALLOCATION_METHODS }).notNull().default('lever'),
	/** Axial positions along the shaft from the compressor nose, mm. */
	bearingCompMm: real('bearing_comp_mm').notNull(),
	bearingTurbMm: real('bearing_turb_mm').notNull(),
	centreOfMassMm: real('centre_of_mass_mm').notNull(),
	planeCompMm: real('plane_comp_mm').notNull(),
	planeTurbMm: real('plane_turb_mm').notNull(),
	/** Correction radius in each plane, mm. */
	radiusCompMm: real('radius_comp_mm').notNull(),
	radiusTurbMm: real('radius_turb_mm').notNull(),
	/** Allowed correction positions per plane (e.g. blades); 0 = anywhere on the circle. */
	positionsComp: integer('positions_comp').notNull().default(0),
	positionsTurb: integer('positions_turb').notNull().default(0),
	/** What the balancing machine shows and the calculator answers in. */
	unbalanceUnit: text('unbalance_unit', { enum: UNBALANCE_UNITS }).notNull().default('g'),
	correctionMode: text('correction_mode', { enum: CORRECTION_MODES }).notNull().default('remove'),
	inducerMm: real('inducer_mm').notNull(),
	exducerMm: real('exducer_mm').notNull(),
	tipSpeedLimitMs: real('tip_speed_limit_ms').notNull(),
	/** Wastegate preset window, kPa gauge; null for models without a wastegate. */
	wastegateMinKpa: real('wastegate_min_kpa'),
	wastegateMaxKpa: real('wastegate_max_kpa'),
	endPlayMinMm: real('end_play_min_mm').notNull(),
	endPlayMaxMm: real('end_play_max_mm').notNull(),
	radialPlayMinMm: real('radial_play_min_mm').notNull(),
	radialPlayMaxMm: real('radial_play_max_mm').notNull(),
	/** Where each number comes from: the maker's data, the shop's choice or the standard. */
	sources: text('sources', { mode: 'json' }).$type<SpecSources>().notNull(),
	/** Invented numbers of the demo shop. */
	demo: integer('demo', { mode: 'boolean' }).notNull().default(false),
	updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull(),
	updatedBy: text('updated_by').references(() => user.id, { onDelete: 'set null' })
});

/** One run on the balancing machine: the readings per plane and what they meant. */
export const balanceRun = sqliteTable(
	'balance_run',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		unitId: integer('unit_id')
			.notNull()
			.references(() => unit.id, { onDelete: 'restrict' }),
		/** 1, 2, 3... within the unit. */
		runNo: integer('run_no').notNull(),
		/** The unit's history position (its version) when the run was recorded. */
		afterSeq: integer('after_seq').notNull(),
		kind: text('kind', { enum: RUN_KINDS }).notNull(),
		trialPlane: text('trial_plane', { enum: PLANE_KEYS }),
		trialAmount: real('trial_amount'),
		trialAngle: real('trial_angle'),
		unbalanceUnit: text('unbalance_unit', { enum: UNBALANCE_UNITS }).notNull(),
		compAmount: real('comp_amount').notNull(),
		compAngle: real('comp_angle').notNull(),
		turbAmount: real('turb_amount').notNull(),
		turbAngle: real('turb_angle').notNull(),
		speedRpm: integer('speed_rpm'),
		/** How the unbalance was worked out: direct (calibrated machine), single or two-plane coefficients. */
		method: text('method').notNull(),
		residualCompGmm: real('residual_comp_gmm'),
		residualTurbGmm: real('residual_turb_gmm'),
		tolCompGmm: real('tol_comp_gmm').notNull(),
		tolTurbGmm: real('tol_turb_gmm').notNull(),
		passed: integer('passed', { mode: 'boolean' }).notNull(),
		/** What the calculator said to correct, per plane (JSON), when the run failed. */
		correction: text('correction', { mode: 'json' }).$type<Record<string, unknown>>(),
		compWheelSerial: text('comp_wheel_serial').notNull(),
		shaftWheelSerial: text('shaft_wheel_serial').notNull(),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'restrict' }),
		stationId: integer('station_id').references(() => station.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		note: text('note')
	},
	(t) => [uniqueIndex('balance_run_unit_no_idx').on(t.unitId, t.runNo), index('balance_run_unit_seq_idx').on(t.unitId, t.afterSeq)]
);

/** The build record of a unit: measured plays, kit lots, wheel serials, wastegate preset. */
export const assemblyRecord = sqliteTable(
	'assembly_record',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		unitId: integer('unit_id')
			.notNull()
			.references(() => unit.id, { onDelete: 'restrict' }),
		afterSeq: integer('after_seq').notNull(),
		endPlayMm: real('end_play_mm').notNull(),
		radialPlayMm: real('radial_play_mm').notNull(),
		bearingKitLot: text('bearing_kit_lot').notNull(),
		sealKitLot: text('seal_kit_lot').notNull(),
		compWheelSerial: text('comp_wheel_serial').notNull(),
		shaftWheelSerial: text('shaft_wheel_serial').notNull(),
		wastegatePresetKpa: real('wastegate_preset_kpa'),
		withinLimits: integer('within_limits', { mode: 'boolean' }).notNull(),
		/** The out-of-limit findings, as sentences. */
		findings: text('findings', { mode: 'json' }).$type<string[]>().notNull(),
		deviationReason: text('deviation_reason'),
		/** The lead or owner who accepted the deviation. */
		approvedBy: text('approved_by').references(() => user.id, { onDelete: 'restrict' }),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'restrict' }),
		stationId: integer('station_id').references(() => station.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull(),
		note: text('note')
	},
	(t) => [index('assembly_record_unit_seq_idx').on(t.unitId, t.afterSeq)]
);

export type ModelSpec = typeof modelSpec.$inferSelect;
export type BalanceRun = typeof balanceRun.$inferSelect;
export type AssemblyRecord = typeof assemblyRecord.$inferSelect;
// Customers' own units: rebuild orders, status links, quotes, payments, e-mail, shipments.
// ---------------------------------------------------------------------------------------

export const rebuildOrder = sqliteTable(
	'rebuild_order',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		code: text('code').notNull().unique(),
		customerName: text('customer_name').notNull(),
		email: text('email').notNull(),
		phone: text('phone').notNull().default(''),
		shipAddress: text('ship_address').notNull(),
		complaint: text('complaint').notNull(),
		/** Calendar date promised to the customer, YYYY-MM-DD. */
		promisedOn: text('promised_on'),
		unitId: integer('unit_id')
			.notNull()
			.unique()
			.references(() => unit.id, { onDelete: 'restrict' }),
		notifyReceived: integer('notify_received', { mode: 'boolean' }).notNull().default(true),
		notifyQuote: integer('notify_quote', { mode: 'boolean' }).notNull().default(true),
		notifyInWork: integer('notify_in_work', { mode: 'boolean' }).notNull().default(true),
		notifyShipped: integer('notify_shipped', { mode: 'boolean' }).notNull().default(true),
		/** After a declined quote: what the customer wants done with the unit. */
		declineChoice: text('decline_choice', { enum: ['return', 'scrap'] }),
		createdBy: text('created_by').references(() => user.id, { onDelete: 'restrict' }),
		createdAt: createdAt()
	},
	(t) => [index('rebuild_order_email_idx').on(t.email)]
);

export const trackLink = sqliteTable(
	'track_link',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		orderId: integer('order_id')
			.notNull()
			.references(() => rebuildOrder.id, { onDelete: 'cascade' }),
		/** SHA-256 of the token, hex. The token itself is never stored. */
		tokenHash: text('token_hash').notNull().unique(),
		createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull(),
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
		revokedAt: integer('revoked_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('track_link_order_idx').on(t.orderId)]
);

export const QUOTE_STATUSES = ['draft', 'sent', 'approved', 'declined'] as const;

export const quote = sqliteTable(
	'quote',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		orderId: integer('order_id')
			.notNull()
			.references(() => rebuildOrder.id, { onDelete: 'cascade' }),
		status: text('status', { enum: QUOTE_STATUSES }).notNull().default('draft'),
		/** Tax rate in basis points (825 = 8.25 %), copied from the setting when the quote is sent. */
		taxRateBp: integer('tax_rate_bp').notNull().default(0),
		/** Core charge (positive) or core credit (negative), in cents; not taxed. */
		coreCents: integer('core_cents').notNull().default(0),
		coreNote: text('core_note').notNull().default(''),
		/** Totals fixed when the quote is sent. */
		subtotalCents: integer('subtotal_cents').notNull().default(0),
		taxCents: integer('tax_cents').notNull().default(0),
		totalCents: integer('total_cents').notNull().default(0),
		sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
		decidedAt: integer('decided_at', { mode: 'timestamp_ms' }),
		checkoutSessionId: text('checkout_session_id'),
		paidAt: integer('paid_at', { mode: 'timestamp_ms' }),
		paidCents: integer('paid_cents'),
		createdAt: createdAt()
	},
	(t) => [index('quote_order_idx').on(t.orderId)]
);

export const quoteLine = sqliteTable(
	'quote_line',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		quoteId: integer('quote_id')
			.notNull()
			.references(() => quote.id, { onDelete: 'cascade' }),
		kind: text('kind', { enum: ['part', 'labour'] }).notNull(),
		description: text('description').notNull(),
		/** Quantity in hundredths (labour hours may be 1.25). */
		quantityHundredths: integer('quantity_hundredths').notNull(),
		unitPriceCents: integer('unit_price_cents').notNull(),
		sortOrder: integer('sort_order').notNull().default(0)
	},
	(t) => [index('quote_line_quote_idx').on(t.quoteId)]
);

/** Webhook events from the payment provider already handled (a replay changes nothing). */
export const paymentEvent = sqliteTable('payment_event', {
	id: text('id').primaryKey(),
	type: text('type').notNull(),
	quoteId: integer('quote_id').references(() => quote.id, { onDelete: 'set null' }),
	receivedAt: integer('received_at', { mode: 'timestamp_ms' }).notNull()
});

export const OUTBOX_STATUSES = ['pending', 'sending', 'sent', 'failed'] as const;

/** E-mail waiting to go out, written in the same transaction as the change it reports. */
export const outboxMessage = sqliteTable(
	'outbox_message',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		kind: text('kind').notNull(),
		orderId: integer('order_id').references(() => rebuildOrder.id, { onDelete: 'set null' }),
		toAddress: text('to_address').notNull(),
		subject: text('subject').notNull(),
		textBody: text('text_body').notNull(),
		htmlBody: text('html_body').notNull(),
		status: text('status', { enum: OUTBOX_STATUSES }).notNull().default('pending'),
		attempts: integer('attempts').notNull().default(0),
		nextAttemptAt: integer('next_attempt_at', { mode: 'timestamp_ms' }).notNull(),
		leaseOwner: text('lease_owner'),
		leaseUntil: integer('lease_until', { mode: 'timestamp_ms' }),
		lastError: text('last_error'),
		sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
		createdAt: createdAt()
	},
	(t) => [index('outbox_due_idx').on(t.status, t.nextAttemptAt), index('outbox_order_idx').on(t.orderId)]
);

/** Every message the local SMTP fake accepted (dev, demo and tests only). */
export const devMail = sqliteTable('dev_mail', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	mailFrom: text('mail_from').notNull(),
	rcptTo: text('rcpt_to').notNull(),
	subject: text('subject').notNull().default(''),
	raw: text('raw').notNull(),
	receivedAt: integer('received_at', { mode: 'timestamp_ms' }).notNull()
});

export const rebuildSetting = sqliteTable('rebuild_setting', {
	key: text('key').primaryKey(),
	value: text('value').notNull()
});

export const shipLocation = sqliteTable('ship_location', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	name: text('name').notNull().unique(),
	address: text('address').notNull().default(''),
	active: integer('active', { mode: 'boolean' }).notNull().default(true)
});

export const SHIP_DESTINATIONS = ['distributor', 'web_order', 'customer'] as const;

export const shipment = sqliteTable(
	'shipment',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		code: text('code').notNull().unique(),
		destination: text('destination', { enum: SHIP_DESTINATIONS }).notNull(),
		locationId: integer('location_id').references(() => shipLocation.id, { onDelete: 'restrict' }),
		orderId: integer('order_id').references(() => rebuildOrder.id, { onDelete: 'restrict' }),
		/** Web order number, for web orders. */
		reference: text('reference').notNull().default(''),
		shipTo: text('ship_to').notNull(),
		carrier: text('carrier').notNull(),
		trackingNumber: text('tracking_number').notNull(),
		createdBy: text('created_by').references(() => user.id, { onDelete: 'restrict' }),
		createdAt: integer('created_at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('shipment_location_idx').on(t.locationId)]
);

export const shipmentUnit = sqliteTable('shipment_unit', {
	shipmentId: integer('shipment_id')
		.notNull()
		.references(() => shipment.id, { onDelete: 'cascade' }),
	unitId: integer('unit_id')
		.primaryKey()
		.references(() => unit.id, { onDelete: 'restrict' })
});

export type RebuildOrder = typeof rebuildOrder.$inferSelect;
export type Quote = typeof quote.$inferSelect;
export type QuoteLine = typeof quoteLine.$inferSelect;
export type OutboxMessage = typeof outboxMessage.$inferSelect;
export type Shipment = typeof shipment.$inferSelect;
// ---- Sign-in throttling (src/lib/server/sign-in-throttle.ts) ----

/** Failed sign-ins per key (`account:<email>` or `address:<ip>`); survives restarts. */
export const signInThrottle = sqliteTable('sign_in_throttle', {
	key: text('key').primaryKey(),
	failures: integer('failures').notNull().default(0),
	windowStart: integer('window_start').notNull(),
	lockedUntil: integer('locked_until').notNull().default(0),
	locks: integer('locks').notNull().default(0),
	consecutive: integer('consecutive').notNull().default(0)
});

/** Locks the owner lifted by hand: append-only, so a lifted lock can always be accounted for. */
export const signInLockLift = sqliteTable(
	'sign_in_lock_lift',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		/** The throttle key, `account:<e-mail>` or `address:<client address>`. */
		key: text('key').notNull(),
		/** When the lock would have ended on its own (ms since the epoch). */
		lockedUntil: integer('locked_until').notNull(),
		liftedBy: text('lifted_by')
			.notNull()
			.references(() => user.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('sign_in_lock_lift_at_idx').on(t.at)]
);
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

// ---------------------------------------------------------------------------------------
// Floor boards: station assignments, teardown checklists, inspection records and photos.
// ---------------------------------------------------------------------------------------

/** Which techs call a station home. A tech may have several; a station several techs. */
export const userStation = sqliteTable(
	'user_station',
	{
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		stationId: integer('station_id')
			.notNull()
			.references(() => station.id, { onDelete: 'cascade' })
	},
	(t) => [uniqueIndex('user_station_pk').on(t.userId, t.stationId), index('user_station_station_idx').on(t.stationId)]
);

/** The teardown checklist for a model family (one per family). */
export const checklist = sqliteTable('checklist', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	family: text('family').notNull().unique(),
	name: text('name').notNull(),
	createdAt: createdAt()
});

export const checklistItem = sqliteTable(
	'checklist_item',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		checklistId: integer('checklist_id')
			.notNull()
			.references(() => checklist.id, { onDelete: 'cascade' }),
		label: text('label').notNull(),
		/** Unit of the optional measurement (e.g. "mm"); null when the item takes none. */
		measureUnit: text('measure_unit'),
		sortOrder: integer('sort_order').notNull().default(0),
		active: integer('active', { mode: 'boolean' }).notNull().default(true)
	},
	(t) => [index('checklist_item_list_idx').on(t.checklistId, t.sortOrder)]
);

/** One teardown qualification: the answers, the verdict and the event that carried it out. */
export const inspection = sqliteTable(
	'inspection',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		unitId: integer('unit_id')
			.notNull()
			.references(() => unit.id, { onDelete: 'restrict' }),
		checklistId: integer('checklist_id').references(() => checklist.id, { onDelete: 'restrict' }),
		verdict: text('verdict', { enum: ['accept', 'scrap'] }).notNull(),
		reasonCode: text('reason_code'),
		note: text('note'),
		userId: text('user_id').references(() => user.id, { onDelete: 'restrict' }),
		stationId: integer('station_id').references(() => station.id, { onDelete: 'restrict' }),
		/** The verdict event's seq within the unit. */
		eventSeq: integer('event_seq'),
		at: integer('at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('inspection_unit_idx').on(t.unitId, t.at)]
);

export const inspectionAnswer = sqliteTable(
	'inspection_answer',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		inspectionId: integer('inspection_id')
			.notNull()
			.references(() => inspection.id, { onDelete: 'cascade' }),
		itemId: integer('item_id').references(() => checklistItem.id, { onDelete: 'set null' }),
		/** The item's words when answered, so a later rename does not rewrite the record. */
		label: text('label').notNull(),
		result: text('result', { enum: ['pass', 'fail', 'na'] }).notNull(),
		measurement: real('measurement'),
		measureUnit: text('measure_unit')
	},
	(t) => [index('inspection_answer_inspection_idx').on(t.inspectionId)]
);

/** A photo of a unit, stored on disk by the SHA-256 of its bytes. */
export const unitPhoto = sqliteTable(
	'unit_photo',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		unitId: integer('unit_id')
			.notNull()
			.references(() => unit.id, { onDelete: 'restrict' }),
		inspectionId: integer('inspection_id').references(() => inspection.id, { onDelete: 'set null' }),
		sha256: text('sha256').notNull(),
		mime: text('mime', { enum: ['image/jpeg', 'image/png', 'image/webp'] }).notNull(),
		bytes: integer('bytes').notNull(),
		width: integer('width'),
		height: integer('height'),
		/** The name the file had on the device; shown only, never used as a path. */
		originalName: text('original_name').notNull().default(''),
		userId: text('user_id').references(() => user.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('unit_photo_unit_idx').on(t.unitId), index('unit_photo_sha_idx').on(t.sha256)]
);

/**
 * Which photos the office shows a customer on their status page: an append-only log, one row
 * per decision (shared, or withdrawn). The latest row for a photo and order is what holds.
 */
export const unitPhotoShare = sqliteTable(
	'unit_photo_share',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		photoId: integer('photo_id')
			.notNull()
			.references(() => unitPhoto.id, { onDelete: 'restrict' }),
		orderId: integer('order_id')
			.notNull()
			.references(() => rebuildOrder.id, { onDelete: 'restrict' }),
		shared: integer('shared', { mode: 'boolean' }).notNull(),
		/** What the customer reads under the photo; never the file's own name or an internal note. */
		caption: text('caption').notNull().default(''),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'restrict' }),
		at: integer('at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('unit_photo_share_order_idx').on(t.orderId, t.photoId, t.id)]
);

export type Checklist = typeof checklist.$inferSelect;
export type ChecklistItem = typeof checklistItem.$inferSelect;
export type Inspection = typeof inspection.$inferSelect;
export type UnitPhoto = typeof unitPhoto.$inferSelect;
export type UnitPhotoShare = typeof unitPhotoShare.$inferSelect;

// ── Owner's reports: shop settings and report indexes ──────────────────────────────────────

/** Shop-wide settings, one row per key (e.g. `labour_rate_cents_per_hour`). */
export const shopSetting = sqliteTable('shop_setting', {
	key: text('key').primaryKey(),
	value: text('value').notNull(),
	updatedAt: integer('updated_at', { mode: 'timestamp_ms' }).notNull()
});
