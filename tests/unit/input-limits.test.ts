/** The shared input rules: blank numbers, strict objects, JSON nesting counted on the raw text. */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { isBlank, optionalNumber, requiredNumber, strictObject } from '../../src/lib/domain/input/fields';
import { clip, jsonDepth, parseJsonBounded, parseStoredJson, pruneDepth, TOO_DEEP } from '../../src/lib/domain/input/json';
import { eventDataView, readStoredData, STORED_DATA_NOTE, UNREADABLE_KEY } from '../../src/lib/domain/units/event-data';

describe('requiredNumber and optionalNumber', () => {
	const n = requiredNumber('Amount', { min: 0, max: 10 });
	test.each(['', '   ', null, undefined])('blank %j is refused with a sentence naming the field', (v) => {
		const r = n.safeParse(v);
		expect(r.success).toBe(false);
		expect(r.error?.issues[0]?.message).toBe('Amount: enter a number.');
	});
	test.each([
		['0', 0],
		[0, 0],
		[' 2.5 ', 2.5],
		['.5', 0.5],
		['1e1', 10]
	])('%j is the reading %d', (v, out) => {
		expect(n.parse(v)).toBe(out);
	});
	test.each(['abc', '0x10', 'Infinity', '1,5', true, {}, [], Number.NaN, Number.POSITIVE_INFINITY])('%j is not a number', (v) => {
		expect(n.safeParse(v).success).toBe(false);
	});
	test('optional: blank is null, a value is checked', () => {
		const o = optionalNumber('Speed', { int: true, min: 1 });
		expect(o.parse('')).toBeNull();
		expect(o.parse(null)).toBeNull();
		expect(o.parse('12')).toBe(12);
		expect(o.safeParse('1.5').success).toBe(false);
		expect(o.safeParse('0').success).toBe(false);
	});
	test('isBlank', () => {
		expect([undefined, null, '', ' \t'].every(isBlank)).toBe(true);
		expect([0, '0', false].some(isBlank)).toBe(false);
	});
});

describe('strictObject', () => {
	test('an unknown key is refused with a sentence naming it', () => {
		const s = strictObject({ a: requiredNumber('A') }, 'The record');
		const r = s.safeParse({ a: 1, colour: 'red' });
		expect(r.error?.issues[0]?.message).toBe('The record does not take the field "colour"; remove it.');
		expect(s.safeParse({ a: 1, b: 2, c: 3 }).error?.issues[0]?.message).toBe('The record does not take the fields "b", "c"; remove them.');
	});
});

describe('JSON nesting', () => {
	test('depth is counted on the text, ignoring brackets inside strings and escaped quotes', () => {
		expect(jsonDepth('1')).toBe(0);
		expect(jsonDepth('{"a":[1,{"b":2}]}')).toBe(3);
		expect(jsonDepth('{"a":"[[[[\\"[[[["}')).toBe(1);
		expect(jsonDepth('['.repeat(100000) + ']'.repeat(100000), 33)).toBe(33);
	});
	test('depth agrees with a recursive count on random values (property)', () => {
		const depth = (v: unknown): number => (v !== null && typeof v === 'object' ? 1 + Math.max(0, ...Object.values(v as object).map(depth)) : 0);
		fc.assert(
			fc.property(fc.jsonValue({ maxDepth: 8 }), (v) => {
				expect(jsonDepth(JSON.stringify(v))).toBe(depth(v));
			})
		);
	});
	test('a body over the limit is refused before parsing; one at the limit parses', () => {
		expect(parseJsonBounded('['.repeat(33) + ']'.repeat(33))).toEqual({ ok: false, reason: 'too_deep' });
		expect(parseJsonBounded('['.repeat(32) + ']'.repeat(32)).ok).toBe(true);
		expect(parseJsonBounded('{nope')).toEqual({ ok: false, reason: 'invalid' });
	});
	test('stored JSON is read whatever its depth, pruned for recursive readers', () => {
		const r = parseStoredJson(`{"a":${'['.repeat(50000)}${']'.repeat(50000)}}`);
		expect(r).toMatchObject({ ok: true, pruned: true });
		expect(JSON.stringify(r.ok && r.value).length).toBeLessThan(200);
		expect(JSON.stringify(pruneDepth([[[1]]], 2))).toBe(JSON.stringify([[TOO_DEEP]]));
	});
	test('clip keeps surrogate pairs whole', () => {
		expect(clip('ab𝄞cd', 4)).toBe('ab…');
		expect(clip('short', 10)).toBe('short');
	});
});

describe('the stored event data view', () => {
	test('known fields pass with their types; anything else becomes a bounded summary with a notice', () => {
		expect(eventDataView({ reason: 'waiting', held: true })).toEqual({ reason: 'waiting', held: true });
		const v = eventDataView({ reason: 'waiting', toStage: 'nowhere', extra: 'x'.repeat(5000) })!;
		expect(v.reason).toBe('waiting');
		expect(v.toStage).toBeUndefined();
		expect(v.notice).toBe(STORED_DATA_NOTE);
		expect(v.unshown!.length).toBeLessThanOrEqual(300);
	});
	test('text that is not a JSON object is kept as a short text', () => {
		expect(readStoredData('nope {')).toEqual({ [UNREADABLE_KEY]: 'nope {' });
		expect(readStoredData('[1]')).toEqual({ [UNREADABLE_KEY]: '[1]' });
		expect(readStoredData(null)).toBeNull();
		expect(eventDataView(readStoredData('nope {'))).toEqual({ unshown: 'nope {', notice: STORED_DATA_NOTE });
	});
	test('a __proto__ key is data, not a prototype', () => {
		const v = eventDataView(readStoredData('{"__proto__":{"reason":"sneaky"}}'))!;
		expect(v.reason).toBeUndefined();
		expect(v.unshown).toContain('__proto__');
	});
});
