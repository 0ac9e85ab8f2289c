import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { getDb } from '$lib/server/db';
import { reorderCards } from '$lib/server/cards';
import { apiError, readJson } from '$lib/server/http';
import type { RequestHandler } from './$types';

const schema = z.object({
	order: z.array(z.object({ id: z.number().int().positive(), version: z.number().int().positive() })).max(500)
});

/** Put the open cards in a new order (top first), naming each with the version it was seen at. */
export const PUT: RequestHandler = async ({ request, locals }) => {
	const body = await readJson(request, schema);
	if (!body.ok) return body.response;
	const user = locals.user!;
	const result = reorderCards(getDb(), { id: user.id, role: user.role }, body.data.order);
	if (!result.ok) return apiError(result.status, result.code, result.message, { cards: result.cards });
	return json({ cards: result.cards });
};
