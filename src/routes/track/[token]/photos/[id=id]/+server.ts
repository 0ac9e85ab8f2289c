import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { resolveTrackToken } from '$lib/server/track-links';
import { sharedPhotoFile } from '$lib/server/photo-sharing';
import { photoResponse, readPhoto } from '$lib/server/photos';
import { LINK_NOT_VALID, trackPhotoLimiter } from '$lib/server/track-limit';
import type { RequestHandler } from './$types';

/**
 * A photo the office shared on this order (`?size=thumb` for the thumbnail). The token must be
 * live and the photo shared on that token's order; anything else gets the same 404, whether
 * the token is wrong or the photo belongs to someone else. Rate-limited per address.
 */
export const GET: RequestHandler = async ({ params, url, getClientAddress }) => {
	if (!trackPhotoLimiter.take(getClientAddress(), Date.now()).allowed) error(429, { message: 'Too many requests from here. Wait a minute and try again.' });
	const db = getDb();
	const orderId = resolveTrackToken(db, params.token);
	const file = orderId === null ? null : sharedPhotoFile(db, orderId, Number(params.id));
	if (!file) error(404, { message: LINK_NOT_VALID });
	const thumb = url.searchParams.get('size') === 'thumb';
	const bytes = readPhoto(file.sha256, thumb ? 'thumb' : 'original');
	if (!bytes) error(404, { message: LINK_NOT_VALID });
	// Sharing can be withdrawn: the browser keeps it for itself only, and asks again soon.
	return photoResponse(bytes, thumb ? 'image/jpeg' : file.mime, 'private, max-age=300', { 'referrer-policy': 'no-referrer', 'x-robots-tag': 'noindex' });
};
