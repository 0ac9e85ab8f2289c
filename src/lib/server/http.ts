/** Small helpers for the JSON API: one error shape everywhere, and safe body parsing. */
import { json } from '@sveltejs/kit';
import type { z } from 'zod';

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
	const out: Record<string, string[]> = {};
	for (const issue of error.issues) {
		const key = issue.path.map(String).join('.') || '_';
		(out[key] ??= []).push(issue.message);
	}
	return out;
}

const MAX_BODY = 64 * 1024;

/** Read and validate a JSON body; returns a ready 400 response when it is not acceptable. */
export async function readJson<T extends z.ZodType>(
	request: Request,
	schema: T
): Promise<{ ok: true; data: z.infer<T> } | { ok: false; response: Response }> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.toLowerCase().includes('application/json')) {
		return { ok: false, response: apiError(415, 'unsupported_media_type', 'Send the body as application/json.') };
	}
	const text = await request.text();
	if (text.length > MAX_BODY) return { ok: false, response: apiError(413, 'too_large', 'The body is too large.') };
	let raw: unknown;
	try {
		raw = JSON.parse(text);
	} catch {
		return { ok: false, response: apiError(400, 'invalid_json', 'The body is not valid JSON.') };
	}
	const parsed = schema.safeParse(raw);
	if (!parsed.success) {
		const fields = zodFields(parsed.error);
		const first = parsed.error.issues[0];
		const where = first?.path.length ? `${first.path.join('.')}: ` : '';
		return { ok: false, response: apiError(400, 'invalid', `${where}${first?.message ?? 'Check the body.'}`, { fields }) };
	}
	return { ok: true, data: parsed.data };
}
