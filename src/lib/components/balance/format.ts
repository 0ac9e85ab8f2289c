/** Number formatting for the balance and assembly screens. */
import { UNBALANCE_UNIT_SHORT, type UnbalanceUnit } from '$lib/domain/balance/tolerance';

export function fmt(v: number | null | undefined, digits = 2): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	return v.toLocaleString('en', { minimumFractionDigits: digits, maximumFractionDigits: digits });
}

/** Amounts in the shop's unit: a sensible number of digits for the size. */
export function amount(v: number, unit: UnbalanceUnit): string {
	const digits = Math.abs(v) >= 100 ? 0 : Math.abs(v) >= 10 ? 1 : Math.abs(v) >= 1 ? 2 : 3;
	return `${fmt(v, digits)} ${UNBALANCE_UNIT_SHORT[unit]}`;
}

export const deg = (v: number): string => `${fmt(v, 1)}°`;

/** g·mm with enough digits for turbo-sized tolerances. */
export function gmm(v: number): string {
	const digits = v >= 100 ? 1 : v >= 1 ? 3 : 4;
	return `${fmt(v, digits)} g·mm`;
}

export const pct = (used: number): string => `${Math.round(used * 100)} %`;
