/** The body of a move request, shared by the API route and the forms that post moves. */
import { z } from 'zod';
import { ACTIONS } from './domain/units/actions';
import { strictObject } from './domain/input/fields';

const MOVE_ACTIONS = ACTIONS.filter((a) => a !== 'receive') as Exclude<(typeof ACTIONS)[number], 'receive'>[];

export const idempotencyKeySchema = z
	.string({ error: 'Send an idempotency key.' })
	.min(8, 'The idempotency key must be 8 to 100 characters.')
	.max(100, 'The idempotency key must be 8 to 100 characters.')
	.regex(/^[\w:.-]+$/, 'The idempotency key may hold letters, digits, and : . _ - only.');

export const stationCodeSchema = z.string({ error: 'Give the station code as text.' }).trim().min(1, 'Give the station code.').max(40, 'Station codes are at most 40 characters.');

/**
 * A move. The shape of `data` depends on the action and is checked exactly by the state machine
 * (`actionData`); here it only has to be a small object.
 */
export const moveRequestSchema = strictObject(
	{
		action: z.enum(MOVE_ACTIONS as [string, ...string[]], { error: 'Unknown action.' }),
		stationCode: stationCodeSchema.nullable().optional(),
		idempotencyKey: idempotencyKeySchema,
		expectedVersion: z.number({ error: 'expectedVersion must be a whole number.' }).int('expectedVersion must be a whole number.').positive('expectedVersion must be a whole number.').optional(),
		note: z.string({ error: 'The note is text.' }).max(1000, 'Keep the note under 1000 characters.').nullable().optional(),
		data: z
			.record(z.string().max(40, 'Data field names are at most 40 characters.'), z.unknown(), { error: 'data is an object of fields.' })
			.refine((d) => Object.keys(d).length <= 20, 'A move carries at most 20 data fields.')
			.optional()
	},
	'A move'
);
export type MoveRequestBody = z.infer<typeof moveRequestSchema>;

/** Moves are small: a note of 1000 characters and a few data fields. */
export const MOVE_BODY_LIMITS = { maxBytes: 16 * 1024 } as const;
