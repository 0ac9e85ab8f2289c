import { fail } from '@sveltejs/kit';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { FAILURE_MODES } from '$lib/domain/warranty/failure-modes';
import { getDb } from '$lib/server/db';
import { listScrapReasons } from '$lib/server/scrap-reasons';
import { applyMove } from '$lib/server/units';
import type { Actions, PageServerLoad } from './$types';
import { optionalNumber, requiredNumber } from '$lib/domain/input/fields';

export const load: PageServerLoad = async () => ({ reasons: listScrapReasons(getDb()), formKey: randomUUID() });

const verdictSchema = z
	.object({
		verdict: z.enum(['accept', 'scrap'], { error: 'Choose accept or scrap.' }),
		failureMode: z.enum(FAILURE_MODES, { error: 'Choose the failure mode the teardown found.' }),
		reasonCode: z.string().trim().optional(),
		labourMinutes: optionalNumber('Teardown minutes', {
			notNumber: 'Give the teardown minutes as a number.',
			int: true,
			whole: 'Give whole minutes.',
			min: 0,
			max: 24 * 60,
			range: 'Teardown minutes: from 0 to 1440 (a day).'
		}),
		idempotencyKey: z.string().min(8).max(80),
		expectedVersion: requiredNumber('The unit version', { blank: 'The form lost the unit version; reload the page.', int: true, min: 1, range: 'The form lost the unit version; reload the page.' })
	})
	.refine((v) => v.verdict !== 'scrap' || !!v.reasonCode, { message: 'Choose a scrap reason.', path: ['reasonCode'] });

export const actions: Actions = {
	verdict: async ({ request, params, locals }) => {
		// Only the form's own fields are read and echoed back; anything else a client sends is ignored.
		const form = await request.formData();
		const FIELDS = ['verdict', 'failureMode', 'reasonCode', 'labourMinutes', 'idempotencyKey', 'expectedVersion'] as const;
		const values: Record<string, string> = {};
		for (const k of FIELDS) {
			const v = form.get(k);
			if (typeof v === 'string') values[k] = v.slice(0, 500);
		}
		const parsed = verdictSchema.safeParse(values);
		if (!parsed.success) return fail(400, { values, error: parsed.error.issues[0]?.message ?? 'Check the form.' });
		const v = parsed.data;
		const data: Record<string, unknown> = { failureMode: v.failureMode };
		if (v.verdict === 'scrap') data.reasonCode = v.reasonCode;
		if (v.labourMinutes !== null) data.labourMinutes = v.labourMinutes;
		const user = locals.user!;
		const result = applyMove(getDb(), { id: user.id, role: user.role }, {
			serial: params.serial,
			action: v.verdict,
			idempotencyKey: v.idempotencyKey,
			expectedVersion: v.expectedVersion,
			data
		});
		if (!result.ok) return fail(result.status, { values, error: result.message });
		return { done: `${result.unit.serial} → ${result.unit.state === 'scrapped' ? 'Scrapped' : 'Accepted'}, failure mode recorded.` };
	}
};
