/**
 * The domain arithmetic refuses a meaningless number (NaN, an infinity, a negative count, more
 * scrapped than judged, a pressure at or below vacuum…) with a RangeError whose message is a
 * sentence. Where such a number came from a request, that sentence is the answer: 400, not 500.
 * A RangeError without a sentence (the engine's own, e.g. a stack overflow) is not ours and is
 * passed on.
 */
import { apiError } from './http';

/** The sentence of a RangeError the domain threw; null for anything else. */
export function badNumberMessage(e: unknown): string | null {
	return e instanceof RangeError && /^[A-Z].*\.$/s.test(e.message) ? e.message : null;
}

/** Run a JSON handler; a domain RangeError answers 400 with its sentence. */
export async function badNumbersAs400(run: () => Response | Promise<Response>): Promise<Response> {
	try {
		return await run();
	} catch (e) {
		const message = badNumberMessage(e);
		if (message !== null) return apiError(400, 'invalid', message);
		throw e;
	}
}
