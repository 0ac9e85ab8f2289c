import { expect, test } from 'vitest';
import { formatSerial, isSerial, normalizeSerial } from '../../src/lib/domain/units/serial';

test('serials are SY- and five digits, more when the shop passes 99999', () => {
	expect(formatSerial(421)).toBe('SY-00421');
	expect(formatSerial(123456)).toBe('SY-123456');
	expect(isSerial('SY-00421')).toBe(true);
	expect(isSerial('SY-421')).toBe(false);
	expect(() => formatSerial(0)).toThrow(RangeError);
});

test('what a scanner or a person types is forgiven', () => {
	expect(normalizeSerial(' sy-00421 ')).toBe('SY-00421');
	expect(normalizeSerial('SY421')).toBe('SY-00421');
	expect(normalizeSerial('SY-00000')).toBeNull();
	expect(normalizeSerial('<script>')).toBeNull();
	expect(normalizeSerial('')).toBeNull();
});
