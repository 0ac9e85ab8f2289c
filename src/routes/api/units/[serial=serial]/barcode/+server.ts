import { eq } from 'drizzle-orm';
import { getDb } from '$lib/server/db';
import { unit } from '$lib/server/db/schema';
import { barcodePng, barcodeSvg, isSymbology } from '$lib/server/barcode';
import { apiError } from '$lib/server/http';
import type { RequestHandler } from './$types';

/** The traveler's barcode for a unit: ?symbology=code128|datamatrix&format=svg|png. */
export const GET: RequestHandler = async ({ params, url }) => {
	const symbology = url.searchParams.get('symbology') ?? 'code128';
	const format = url.searchParams.get('format') ?? 'svg';
	if (!isSymbology(symbology)) return apiError(400, 'invalid', 'symbology is code128 or datamatrix.');
	if (format !== 'svg' && format !== 'png') return apiError(400, 'invalid', 'format is svg or png.');
	const found = getDb().select({ id: unit.id }).from(unit).where(eq(unit.serial, params.serial)).get();
	if (!found) return apiError(404, 'not_found', `No unit ${params.serial} in the shop.`);
	const headers = { 'cache-control': 'private, max-age=86400, immutable' };
	if (format === 'svg') {
		return new Response(barcodeSvg(symbology, params.serial), { headers: { ...headers, 'content-type': 'image/svg+xml' } });
	}
	const png = await barcodePng(symbology, params.serial);
	return new Response(new Uint8Array(png), { headers: { ...headers, 'content-type': 'image/png' } });
};
