/** Where uploaded files live, and how a not yet committed upload is named (no image code here, so scripts load fast). */
import { resolve } from 'node:path';

/** Temporary files of uploads whose write has not committed start with this. */
export const INCOMING_PREFIX = '.incoming-';

export function uploadsDir(): string {
	return resolve(process.env.UPLOADS_DIR ?? 'data/uploads');
}
