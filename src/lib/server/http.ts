/** Small helpers for the JSON API: one error shape everywhere, and safe body parsing. */
import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { MAX_JSON_DEPTH, parseJsonBounded, tooDeepMessage } from '../domain/input/json';

export interface ApiErrorBody {
	error: { code: string; message: string; fields?: Record<string, string[]> };
	[extra: string]: unknown;
}

export function apiError(
	status: number,
	code: string,
	message: string,
	extra: { fields?: Record<string, string[]>; [key: string]: unknown } = {}
): Response {
	const { fields, ...rest } = extra;
	const body: ApiErrorBody = { error: { code, message, ...(fields ? { fields } : {}) }, ...rest };
	return json(body, { status });
}

export function zodFields(error: z.ZodError): Record<string, string[]> {
	const out: Record<string, string[]> = Object.create(null); // a key such as "__proto__" is a field name like any other
	for (const issue of error.issues) {
		// an unknown key is reported under its own name, so a form can point at it
		const keys = issue.code === 'unrecognized_keys' ? issue.keys.map((k) => [...issue.path, k]) : [issue.path];
		for (const path of keys) {
			const key = path.map(String).join('.') || '_';
			(out[key] ??= []).push(issue.message);
		}
	}
	return out;
}

/** Limits of one JSON body; each route sets its own, sized to what it legitimately takes. */
export interface BodyLimits {
	/** Most bytes (as sent, UTF-8) the body may have. */
	maxBytes: number;
	/** Deepest nesting of objects and arrays; counted on the raw text before parsing. */
	maxDepth?: number;
}

export const DEFAULT_BODY_LIMITS: Required<BodyLimits> = { maxBytes: 64 * 1024, maxDepth: MAX_JSON_DEPTH };

function kib(bytes: number): string {
	return bytes >= 1024 ? `${Math.round(bytes / 1024)} KB` : `${bytes} bytes`;
}

/**
 * Read a request body as text, stopping as soon as it passes `maxBytes` (a declared length over it
 * is refused before reading anything).
 */
export async function readBodyText(request: Request, maxBytes: number): Promise<{ ok: true; text: string } | { ok: false; reason: 'too_large' | 'not_utf8' }> {
	const declared = Number(request.headers.get('content-length') ?? '');
	if (Number.isFinite(declared) && declared > maxBytes) return { ok: false, reason: 'too_large' };
	const chunks: Uint8Array[] = [];
	let size = 0;
	if (request.body) {
		const reader = request.body.getReader();
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			size += value.byteLength;
			if (size > maxBytes) {
				await reader.cancel().catch(() => {});
				return { ok: false, reason: 'too_large' };
			}
			chunks.push(value);
		}
	}
	const bytes = new Uint8Array(size);
	let at = 0;
	for (const c of chunks) {
		bytes.set(c, at);
		at += c.byteLength;
	}
	try {
		return { ok: true, text: new TextDecoder('utf-8', { fatal: true }).decode(bytes) };
	} catch {
		return { ok: false, reason: 'not_utf8' };
	}
}

/** The first problem of a failed parse as one sentence, prefixed with where it is. */
export function firstIssueMessage(error: z.ZodError, fallback = 'Check the body.'): string {
	const first = error.issues[0];
	if (!first) return fallback;
	const where = first.path.length ? `${first.path.map(String).join('.')}: ` : '';
	return `${where}${first.message}`;
}

/**
 * Read and validate a JSON body: the one place that enforces the content type, the size (in bytes,
 * read with a limit), the nesting depth (counted on the raw text before parsing) and the schema.
 * Returns a ready 4xx response with a sentence when the body is not acceptable.
 */
export async function readJson<T extends z.ZodType>(
	request: Request,
	schema: T,
	limits: BodyLimits = DEFAULT_BODY_LIMITS
): Promise<{ ok: true; data: z.infer<T> } | { ok: false; response: Response }> {
	const maxBytes = limits.maxBytes;
	const maxDepth = limits.maxDepth ?? MAX_JSON_DEPTH;
	const type = request.headers.get('content-type') ?? '';
	if (!type.toLowerCase().includes('application/json')) {
		return { ok: false, response: apiError(415, 'unsupported_media_type', 'Send the body as application/json.') };
	}
	const body = await readBodyText(request, maxBytes);
	if (!body.ok) {
		return body.reason === 'too_large'
			? { ok: false, response: apiError(413, 'too_large', `The body is too large: this request takes at most ${kib(maxBytes)}.`) }
			: { ok: false, response: apiError(400, 'invalid_json', 'The body is not valid UTF-8 text.') };
	}
	const parsed = parseJsonBounded(body.text, maxDepth);
	if (!parsed.ok) {
		return parsed.reason === 'too_deep'
			? { ok: false, response: apiError(400, 'too_deep', tooDeepMessage(maxDepth)) }
			: { ok: false, response: apiError(400, 'invalid_json', 'The body is not valid JSON.') };
	}
	const checked = schema.safeParse(parsed.value);
	if (!checked.success) {
		return { ok: false, response: apiError(400, 'invalid', firstIssueMessage(checked.error), { fields: zodFields(checked.error) }) };
	}
	return { ok: true, data: checked.data };
}
