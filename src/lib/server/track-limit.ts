/** The rate limits on status-link requests, per client address (one limiter each per process). */
import { TokenBucketLimiter } from '../domain/customer/rate-limit';

const perMinute = Math.max(1, Number(process.env.TRACK_RATE_LIMIT ?? 30));

/** The status page and its forms. */
export const trackLimiter = new TokenBucketLimiter(perMinute, perMinute / 60);

/** Shared photos: a page shows several at once, so the bucket is larger; each still needs a live token. */
export const trackPhotoLimiter = new TokenBucketLimiter(perMinute * 4, (perMinute * 4) / 60);

export const LINK_NOT_VALID = 'This link is not valid. Ask the shop to send you a new one.';
