/**
 * Status links: 32 random bytes as base64url go to the customer; only their SHA-256 is
 * kept. A link expires (90 days by default) and can be revoked; `resolveTrackToken`
 * answers null for a wrong, expired or revoked token alike.
 */
import { and, eq, gt, isNull } from 'drizzle-orm';
import { createHash, randomBytes } from 'node:crypto';
import type { DbOrTx } from './db';
import { trackLink } from './db/schema';

export const TOKEN_BYTES = 32;
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export function linkDays(): number {
	const d = Number(process.env.TRACK_LINK_DAYS ?? 90);
	return Number.isFinite(d) && d > 0 ? d : 90;
}

export function hashToken(token: string): string {
	return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function newToken(): string {
	return randomBytes(TOKEN_BYTES).toString('base64url');
}

/** Revoke the order's live links and issue a new one; returns the token (shown once). */
export function issueTrackLink(tx: DbOrTx, orderId: number, now: Date = new Date(), days = linkDays()): string {
	revokeTrackLinks(tx, orderId, now);
	const token = newToken();
	tx.insert(trackLink)
		.values({ orderId, tokenHash: hashToken(token), createdAt: now, expiresAt: new Date(now.getTime() + days * 86_400_000) })
		.run();
	return token;
}

export function revokeTrackLinks(tx: DbOrTx, orderId: number, now: Date = new Date()): number {
	return tx
		.update(trackLink)
		.set({ revokedAt: now })
		.where(and(eq(trackLink.orderId, orderId), isNull(trackLink.revokedAt)))
		.run().changes;
}

/** The order a live token belongs to, or null. */
export function resolveTrackToken(db: DbOrTx, token: string, now: Date = new Date()): number | null {
	if (!TOKEN_PATTERN.test(token)) return null;
	const row = db
		.select({ orderId: trackLink.orderId })
		.from(trackLink)
		.where(and(eq(trackLink.tokenHash, hashToken(token)), isNull(trackLink.revokedAt), gt(trackLink.expiresAt, now)))
		.get();
	return row?.orderId ?? null;
}

export function liveLink(db: DbOrTx, orderId: number, now: Date = new Date()) {
	return (
		db
			.select({ createdAt: trackLink.createdAt, expiresAt: trackLink.expiresAt })
			.from(trackLink)
			.where(and(eq(trackLink.orderId, orderId), isNull(trackLink.revokedAt), gt(trackLink.expiresAt, now)))
			.get() ?? null
	);
}
