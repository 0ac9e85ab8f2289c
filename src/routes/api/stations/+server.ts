import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { listStations } from '$lib/server/stations';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => json({ stations: listStations(getDb()) });
