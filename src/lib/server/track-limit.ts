/** The rate limit on status-link requests, per client address (one limiter per process). */
import { TokenBucketLimiter } from '../domain/customer/rate-limit';

const perMinute = Math.max(1, Number(process.env.TRACK_RATE_LIMIT ?? 30));

export const trackLimiter = new TokenBucketLimiter(perMinute, perMinute / 60);

export const LINK_NOT_VALID = 'This link is not valid. Ask the shop to send you a new one.';
