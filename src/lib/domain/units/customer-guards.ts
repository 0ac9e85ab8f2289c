/**
 * Guards for customers' own units: no work past acceptance before the customer approved the
 * quote, and only a customer's unit whose quote was declined goes back unrepaired.
 */
import type { Guard } from './guards';

/** `clean` is the first move of real work; a customer's unit needs an approved quote first. */
export const quoteApprovedBeforeWork: Guard = ({ unit, facts }) => {
	if (facts.quoteApproved === false) {
		return `${unit.serial} is a customer's unit; its quote must be approved by the customer before work starts.`;
	}
	return null;
};

/** Returning unrepaired is for a customer's unit after the customer declined the quote. */
export const returnOnlyCustomerUnits: Guard = ({ unit, facts }) => {
	if (!facts.customerUnit) return `${unit.serial} is not a customer's unit; only a customer's unit goes back unrepaired.`;
	if (!facts.quoteDeclined) return `${unit.serial}: the customer has not declined a quote; it goes back unrepaired only after a decline.`;
	return null;
};
