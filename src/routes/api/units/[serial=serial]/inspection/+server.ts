import { json } from '@sveltejs/kit';
import { MAX_PHOTO_BYTES, MAX_PHOTOS } from '$lib/domain/photos/image-type';
import { checklistForSerial } from '$lib/server/checklists';
import { getDb } from '$lib/server/db';
import { apiError } from '$lib/server/http';
import { recordQualification, unitInspections } from '$lib/server/inspections';
import type { MoveResult } from '$lib/server/units';
import { keepIfCommitted, stagePhotos, type PhotoUpload } from '$lib/server/photos';
import type { RequestHandler } from './$types';

const MAX_REQUEST = MAX_PHOTOS * MAX_PHOTO_BYTES + 1024 * 1024;

/** The checklist for the unit's model family (null when there is none) and its qualifications. */
export const GET: RequestHandler = async ({ params }) =>
	json({ checklist: checklistForSerial(getDb(), params.serial), inspections: unitInspections(getDb(), params.serial) });

/**
 * Record a teardown qualification (multipart form): the checklist answers (`result-<item>`,
 * `measure-<item>`), `verdict`, `reasonCode`, `note`, `labourMinutes` (optional), `stationCode`, `idempotencyKey` and any
 * number of `photos`.
 *
 * Nothing reaches the disk for a move that will not happen: the whole move is first checked
 * and rolled back (unit, station, role, route, guards), then the photos are checked and written
 * under temporary names, the move and its rows commit in one transaction, and only then are the
 * files renamed to their hash names. A refusal at any step removes the temporary files.
 */
export const POST: RequestHandler = async ({ params, request, locals }) => {
	const user = locals.user!;
	const type = request.headers.get('content-type') ?? '';
	if (!type.includes('multipart/form-data')) return apiError(415, 'unsupported_media_type', 'Send the qualification as multipart/form-data.');
	const length = Number(request.headers.get('content-length') ?? 0);
	if (length > MAX_REQUEST) return apiError(413, 'too_large', `Too much at once: at most ${MAX_PHOTOS} photos of ${MAX_PHOTO_BYTES / 1024 / 1024} MB each.`);
	let form: FormData;
	try {
		form = await request.formData();
	} catch {
		return apiError(400, 'invalid', 'The form could not be read; send it again.');
	}
	const text = (name: string) => {
		const v = form.get(name);
		return typeof v === 'string' ? v.slice(0, 2000) : null;
	};
	const key = text('idempotencyKey') ?? '';
	if (!/^[\w:.-]{8,100}$/.test(key)) return apiError(400, 'invalid', 'Send an idempotency key of 8 to 100 characters.', { fields: { idempotencyKey: ['Missing or malformed.'] } });

	const files = form.getAll('photos').filter((f): f is File => typeof f !== 'string' && f.size > 0);
	if (files.length > MAX_PHOTOS) return apiError(400, 'invalid', `At most ${MAX_PHOTOS} photos per qualification.`, { fields: { photos: ['Too many photos.'] } });
	const uploads: PhotoUpload[] = [];
	for (const f of files) {
		if (f.size > MAX_PHOTO_BYTES) {
			return apiError(400, 'invalid', `${f.name.slice(0, 80)} is ${(f.size / 1024 / 1024).toFixed(1)} MB; photos may be at most ${(MAX_PHOTO_BYTES / 1024 / 1024).toFixed(1)} MB.`, { fields: { photos: ['Too large.'] } });
		}
		uploads.push({ name: f.name, bytes: new Uint8Array(await f.arrayBuffer()) });
	}

	const answers: Record<number, { result?: string | null; measurement?: string | null }> = {};
	for (const [name, value] of form.entries()) {
		const m = /^(result|measure)-(\d{1,9})$/.exec(name);
		if (!m || typeof value !== 'string') continue;
		const id = Number(m[2]);
		answers[id] ??= {};
		if (m[1] === 'result') answers[id].result = value;
		else answers[id].measurement = value.slice(0, 40);
	}
	const verdict = text('verdict');
	if (verdict !== 'accept' && verdict !== 'scrap') return apiError(400, 'invalid', 'Choose a verdict: accept or scrap.', { fields: { verdict: ['Choose a verdict.'] } });
	if (verdict === 'scrap' && !text('reasonCode')?.trim()) return apiError(400, 'invalid', 'Choose a scrap reason.', { fields: { reasonCode: ['Choose a scrap reason.'] } });

	const db = getDb();
	const actor = { id: user.id, role: user.role };
	const input = {
		serial: params.serial,
		stationCode: text('stationCode'),
		idempotencyKey: key,
		verdict,
		reasonCode: text('reasonCode'),
		note: text('note'),
		labourMinutes: text('labourMinutes'),
		answers
	};
	const refused = (result: Extract<MoveResult, { ok: false }>) =>
		apiError(result.status, result.code, result.message, {
			...(result.fields ? { fields: result.fields } : {}),
			...(result.unit ? { unit: result.unit } : {})
		});

	// the move as it would go now, rolled back: a refused move never writes a file
	const trial = recordQualification(db, actor, { ...input, photos: [] }, new Date(), { dryRun: true });
	if (!trial.ok) return refused(trial);
	if (trial.replayed) return json({ unit: trial.unit, event: trial.event, replayed: true, photos: 0 }, { status: trial.status });

	const staged = await stagePhotos(uploads);
	if (!staged.ok) return apiError(400, 'invalid', staged.message, { fields: { photos: [staged.message] } });
	const result = keepIfCommitted(
		staged.staged,
		() => recordQualification(db, actor, { ...input, photos: staged.staged.photos }),
		(r) => r.ok && !r.replayed
	);
	if (!result.ok) return refused(result);
	return json({ unit: result.unit, event: result.event, replayed: result.replayed, photos: result.replayed ? 0 : staged.staged.photos.length }, { status: result.status });
};
