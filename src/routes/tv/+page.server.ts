import { error } from '@sveltejs/kit';
import { stationBoard } from '$lib/server/board';
import { getDb } from '$lib/server/db';
import { listStations } from '$lib/server/stations';
import { STAGES } from '$lib/domain/units/states';
import type { PageServerLoad } from './$types';

/**
 * A wall screen for an area: `?stations=WASH,BLAST` (one or more station codes) or
 * `?stage=clean` (every station of a stage). No controls, large type, live.
 */
export const load: PageServerLoad = async ({ url }) => {
	const db = getDb();
	const all = listStations(db);
	const stage = url.searchParams.get('stage');
	const wanted = (url.searchParams.get('stations') ?? '')
		.split(',')
		.map((s) => s.trim())
		.filter(Boolean)
		.slice(0, 6);
	let codes: string[];
	if (wanted.length) codes = wanted.filter((c) => all.some((s) => s.code === c));
	else if (stage && (STAGES as readonly string[]).includes(stage)) codes = all.filter((s) => s.stage === stage).map((s) => s.code);
	else codes = [];
	if (!codes.length) {
		if (wanted.length || stage) error(404, { message: 'None of those stations exist. Open TV mode from a station board, or give ?stations=CODE,CODE.' });
		return { boards: [], stations: all.map((s) => ({ code: s.code, name: s.name, stage: s.stage })) };
	}
	return { boards: codes.map((c) => stationBoard(db, c)!), stations: [] };
};
