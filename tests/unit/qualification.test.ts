import { describe, expect, test } from 'vitest';
import sharp from 'sharp';
import { PNG } from 'pngjs';
import { checkQualification, parseLabourMinutes } from '../../src/lib/domain/inspection/qualification';
import { checkPhoto, sniffImage } from '../../src/lib/domain/photos/image-type';
import { decide } from '../../src/lib/domain/units/machine';
import { formatDuration, isOverdue, timeInStates } from '../../src/lib/domain/units/stage-time';

const items = [
	{ id: 1, label: 'Turbine housing cracks', measureUnit: null },
	{ id: 2, label: 'Bearing bore', measureUnit: 'mm' }
];

describe('checkQualification', () => {
	test('a complete accept passes, with the measurement read as a number (a decimal comma too)', () => {
		const q = checkQualification(items, { verdict: 'accept', answers: { 1: { result: 'pass' }, 2: { result: 'pass', measurement: '16,004' } } });
		expect(q).toEqual({
			ok: true,
			verdict: 'accept',
			reasonCode: null,
			note: null,
			labourMinutes: null,
			answers: [
				{ itemId: 1, label: 'Turbine housing cracks', result: 'pass', measurement: null, measureUnit: null },
				{ itemId: 2, label: 'Bearing bore', result: 'pass', measurement: 16.004, measureUnit: 'mm' }
			]
		});
	});
	test('teardown minutes are optional whole minutes up to a shift (600)', () => {
		expect(['', '  ', null, undefined].map((t) => parseLabourMinutes(t))).toEqual([null, null, null, null]);
		expect(['0', '35', ' 600 '].map((t) => parseLabourMinutes(t))).toEqual([0, 35, 600]);
		expect(['601', '-5', '12.5', '1e2', 'ten', '35 min', 'NaN', '00000001'].map((t) => parseLabourMinutes(t))).toEqual(Array(8).fill(undefined));
		const ok = checkQualification(items, { verdict: 'scrap', reasonCode: 'BORE', labourMinutes: '42', answers: { 1: { result: 'fail' }, 2: { result: 'na' } } });
		expect(ok).toMatchObject({ ok: true, verdict: 'scrap', labourMinutes: 42 });
		const bad = checkQualification(items, { verdict: 'accept', labourMinutes: '4000', answers: { 1: { result: 'pass' }, 2: { result: 'pass' } } });
		expect(bad).toEqual({ ok: false, message: 'Teardown minutes: a whole number from 0 to 600, or leave it empty.', fields: { labourMinutes: 'Teardown minutes: a whole number from 0 to 600, or leave it empty.' } });
	});
	test('a missing verdict is refused first', () => {
		expect(checkQualification(items, { answers: { 1: { result: 'pass' }, 2: { result: 'na' } } })).toMatchObject({ ok: false, message: 'Choose a verdict: accept or scrap.' });
	});
	test('a scrap without a reason is refused', () => {
		expect(checkQualification(items, { verdict: 'scrap', answers: { 1: { result: 'fail' }, 2: { result: 'na' } } })).toMatchObject({ ok: false, message: 'Choose a scrap reason.' });
	});
	test('unanswered items are named', () => {
		expect(checkQualification(items, { verdict: 'accept', answers: { 1: { result: 'pass' } } })).toMatchObject({
			ok: false,
			message: 'Answer every item: Bearing bore is not answered.',
			fields: { 'item-2': 'Answer pass, fail or n.a.' }
		});
	});
	test('a measurement that is not a number is refused', () => {
		expect(checkQualification(items, { verdict: 'accept', answers: { 1: { result: 'pass' }, 2: { result: 'pass', measurement: '16 mm' } } })).toMatchObject({ ok: false });
	});
	test('no checklist: the verdict alone is enough', () => {
		expect(checkQualification([], { verdict: 'scrap', reasonCode: 'BORE', answers: {} })).toMatchObject({ ok: true, verdict: 'scrap', reasonCode: 'BORE' });
	});
});

describe('the accept guard', () => {
	const unit = { serial: 'SY-00010', state: 'inspected' as const, held: false, holdReason: null };
	const req = { action: 'accept' as const, role: 'tech' as const, stationStage: 'teardown' as const };
	test('where the family has a checklist, accept needs the record', () => {
		expect(decide(unit, req, { inspectionRequired: true, hasInspectionRecord: false })).toEqual({
			ok: false,
			kind: 'refused',
			message: 'SY-00010: fill in the teardown checklist before accepting it.'
		});
		expect(decide(unit, req, { inspectionRequired: true, hasInspectionRecord: true }).ok).toBe(true);
	});
	test('where it has none, accept goes through on the verdict', () => {
		expect(decide(unit, req, { inspectionRequired: false }).ok).toBe(true);
	});
});

function png(width = 4, height = 3): Buffer {
	const p = new PNG({ width, height });
	p.data.fill(200);
	return PNG.sync.write(p);
}

describe('image type from the bytes', () => {
	// Reference: sharp (libvips) reads the same bytes and reports the format it decoded.
	test('PNG, JPEG and WebP made by sharp are recognised as sharp reports them', async () => {
		const base = sharp(png(8, 8));
		const samples = { png: await base.clone().png().toBuffer(), jpeg: await base.clone().jpeg().toBuffer(), webp: await base.clone().webp().toBuffer() };
		for (const [format, buf] of Object.entries(samples)) {
			const meta = await sharp(buf).metadata();
			expect(meta.format).toBe(format);
			expect(sniffImage(buf)).toBe(`image/${format}`);
		}
	});
	test('text, a GIF and a truncated signature are not images the shop keeps', () => {
		expect(sniffImage(new TextEncoder().encode('hello, this is not a photo'))).toBeNull();
		expect(sniffImage(new TextEncoder().encode('GIF89a....'))).toBeNull();
		expect(sniffImage(new Uint8Array([0x89, 0x50, 0x4e, 0x47]))).toBeNull();
		expect(sniffImage(new TextEncoder().encode('RIFF\0\0\0\0WAVE'))).toBeNull();
	});
	test('size is checked before the bytes, with a clear message', () => {
		expect(checkPhoto('big.png', new Uint8Array(2 * 1024 * 1024 + 1), 2 * 1024 * 1024)).toEqual({ ok: false, message: 'big.png is 2.0 MB; photos may be at most 2.0 MB.' });
		expect(checkPhoto('empty.jpg', new Uint8Array(0))).toEqual({ ok: false, message: 'empty.jpg is empty.' });
		expect(checkPhoto('notes.jpg', new TextEncoder().encode('plain text'))).toEqual({ ok: false, message: 'notes.jpg is not a JPEG, PNG or WebP image.' });
		expect(checkPhoto('tool.exe', png())).toEqual({ ok: true, mime: 'image/png' });
	});
});

describe('time in states and overdue', () => {
	// Worked by hand: received 08:00, inspected 10:30, accepted 11:00, now 13:00 on the same day
	// → received 2.5 h, inspected 0.5 h, accepted 2 h (ECMAScript Date arithmetic on ISO instants).
	const h = [
		{ fromState: null, toState: 'received' as const, at: '2026-12-01T08:00:00Z' },
		{ fromState: 'received' as const, toState: 'inspected' as const, at: '2026-12-01T10:30:00Z' },
		{ fromState: 'inspected' as const, toState: 'accepted' as const, at: '2026-12-01T11:00:00Z' }
	];
	test('spans per state', () => {
		expect(timeInStates(h, new Date('2026-12-01T13:00:00Z'))).toEqual([
			{ state: 'received', ms: 2.5 * 3_600_000, current: false },
			{ state: 'inspected', ms: 0.5 * 3_600_000, current: false },
			{ state: 'accepted', ms: 2 * 3_600_000, current: true }
		]);
	});
	test('a state visited twice (after an undo) adds both spans', () => {
		const withUndo = [...h, { fromState: 'accepted' as const, toState: 'inspected' as const, at: '2026-12-01T11:30:00Z' }];
		const spans = timeInStates(withUndo, new Date('2026-12-01T12:00:00Z'));
		expect(spans.find((s) => s.state === 'inspected')).toEqual({ state: 'inspected', ms: 3_600_000, current: true });
	});
	test('overdue only past the threshold', () => {
		const since = '2026-12-01T00:00:00Z';
		expect(isOverdue(since, new Date('2026-12-02T00:00:00Z'), 24)).toBe(false);
		expect(isOverdue(since, new Date('2026-12-02T00:00:01Z'), 24)).toBe(true);
		expect(formatDuration(90 * 60_000)).toBe('2 h');
		expect(formatDuration(20 * 60_000)).toBe('20 min');
		expect(formatDuration(72 * 3_600_000)).toBe('3 d');
	});
});
