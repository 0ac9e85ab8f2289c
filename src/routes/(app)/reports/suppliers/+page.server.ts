import { getDb } from '$lib/server/db';
import { reportOptions } from '$lib/server/reports/options';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => reportOptions(getDb());
