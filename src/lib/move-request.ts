/** The body of a move request, shared by the API route and the forms that post moves. */
import { z } from 'zod';
import { ACTIONS } from './domain/units/actions';

const MOVE_ACTIONS = ACTIONS.filter((a) => a !== 'receive') as Exclude<(typeof ACTIONS)[number], 'receive'>[];

export const moveRequestSchema = z.object({
	action: z.enum(MOVE_ACTIONS as [string, ...string[]], { error: 'Unknown action.' }),
	stationCode: z.string().trim().min(1).max(40, 'Station codes are at most 40 characters.').nullable().optional(),
	idempotencyKey: z
		.string({ error: 'Send an idempotency key.' })
		.min(8, 'The idempotency key must be 8 to 100 characters.')
		.max(100, 'The idempotency key must be 8 to 100 characters.')
		.regex(/^[\w:.-]+$/, 'The idempotency key may hold letters, digits, and : . _ - only.'),
	expectedVersion: z.number({ error: 'expectedVersion must be a whole number.' }).int().positive().optional(),
	note: z.string().max(1000, 'Keep the note under 1000 characters.').nullable().optional(),
	data: z.record(z.string(), z.unknown()).optional()
});
export type MoveRequestBody = z.infer<typeof moveRequestSchema>;
