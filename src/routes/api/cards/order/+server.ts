import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { getDb } from '$lib/server/db';
import { reorderCards } from '$lib/server/cards';
import { apiError, readJson } from '$lib/server/http';
import { strictObject } from '$lib/domain/input/fields';
import type { RequestHandler } from './$types';

const schema = strictObject(
	{
		order: z
			.array(
				strictObject(
					{
						id: z.number({ error: 'Each card has a numeric id.' }).int('Each card has a whole-number id.').positive('Each card has a positive id.'),
						version: z.number({ error: 'Each card names the version it was seen at.' }).int('Versions are whole numbers.').positive('Versions are positive.')
					},
					'A card in the order'
				),
				{ error: 'Send the order as a list of cards.' }
			)
			.max(500, 'At most 500 cards in one order.')
	},
	'A card order'
);

/** 500 cards of `{"id":…,"version":…}` fit well within 32 KB. */
const LIMITS = { maxBytes: 32 * 1024, maxDepth: 4 };

/** Put the open cards in a new order (top first), naming each with the version it was seen at. */
export const PUT: RequestHandler = async ({ request, locals }) => {
	const body = await readJson(request, schema, LIMITS);
	if (!body.ok) return body.response;
	const user = locals.user!;
	const result = reorderCards(getDb(), { id: user.id, role: user.role }, body.data.order);
	if (!result.ok) return apiError(result.status, result.code, result.message, { cards: result.cards });
	return json({ cards: result.cards });
};
