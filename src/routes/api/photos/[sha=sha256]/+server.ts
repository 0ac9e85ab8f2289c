import { getDb } from '$lib/server/db';
import { apiError } from '$lib/server/http';
import { photoMime } from '$lib/server/inspections';
import { photoResponse, readPhoto } from '$lib/server/photos';
import type { RequestHandler } from './$types';

/**
 * A unit photo by its content hash (`?size=thumb` for the thumbnail). The hash is checked by
 * the route's matcher and must belong to a recorded photo; nothing else from the request is
 * used to find the file.
 */
export const GET: RequestHandler = async ({ params, url }) => {
	const mime = photoMime(getDb(), params.sha);
	if (!mime) return apiError(404, 'not_found', 'No such photo.');
	const thumb = url.searchParams.get('size') === 'thumb';
	const bytes = readPhoto(params.sha, thumb ? 'thumb' : 'original');
	if (!bytes) return apiError(404, 'not_found', 'The photo file is missing from the store.');
	return photoResponse(bytes, thumb ? 'image/jpeg' : mime, 'private, max-age=31536000, immutable');
};
