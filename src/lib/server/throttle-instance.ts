import { rateLimitEnabled } from './config';
import { db } from './db';
import { Throttle } from './throttle';

/** The app's one throttle, on the app's database; off when `PADPROOF_RATE_LIMIT=off`. */
export const throttle = new Throttle(db, { enabled: rateLimitEnabled() });
