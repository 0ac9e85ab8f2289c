import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { listCards } from '$lib/server/cards';
import type { RequestHandler } from './$types';

/** The open cards, top of the board first. */
export const GET: RequestHandler = async () => json({ cards: listCards(getDb()) });
