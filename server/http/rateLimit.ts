// Rate limits for routes anyone may call (express-rate-limit), counted in PostgreSQL so that every
// server process shares one count and a restart forgets nothing: a fixed window per key, started by
// its first hit. Over the limit the answer is 429 with the time to wait, in the API's error shape.
import { rateLimit, ipKeyGenerator, type Store, type Options } from 'express-rate-limit';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../db';
import { AppError } from './errors';

class PostgresStore implements Store {
  localKeys = false;
  windowMs = 60_000;
  constructor(readonly prefix: string) {}

  init(options: Options) {
    this.windowMs = options.windowMs;
  }

  async increment(key: string) {
    const [row] = await sequelize.query<{ hits: number; resetAt: Date }>(
      `INSERT INTO rate_limit_hits (key, hits, reset_at) VALUES (:key, 1, now() + make_interval(secs => :seconds))
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN rate_limit_hits.reset_at <= now() THEN 1 ELSE rate_limit_hits.hits + 1 END,
         reset_at = CASE WHEN rate_limit_hits.reset_at <= now() THEN now() + make_interval(secs => :seconds) ELSE rate_limit_hits.reset_at END
       RETURNING hits, reset_at AS "resetAt"`,
      { type: QueryTypes.SELECT, replacements: { key: this.prefix + key, seconds: this.windowMs / 1000 } },
    );
    return { totalHits: row.hits, resetTime: row.resetAt };
  }

  async decrement(key: string) {
    await sequelize.query('UPDATE rate_limit_hits SET hits = greatest(hits - 1, 0) WHERE key = :key', { replacements: { key: this.prefix + key } });
  }

  async resetKey(key: string) {
    await sequelize.query('DELETE FROM rate_limit_hits WHERE key = :key', { replacements: { key: this.prefix + key } });
  }
}

/** Deletes counters whose window ended a day ago or more (run by a scheduled job). */
export async function sweepRateLimits() {
  await sequelize.query(`DELETE FROM rate_limit_hits WHERE reset_at < now() - interval '1 day'`);
}

const waitText = (seconds: number) => (seconds < 90 ? `${seconds} seconds` : `${Math.ceil(seconds / 60)} minutes`);

/** At most `limit` requests per client address and window for the routes it guards (`name` keeps
 * the counts of different limits apart). */
export function addressRateLimit(name: string, limit: number, windowMinutes: number) {
  return rateLimit({
    windowMs: windowMinutes * 60_000,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    store: new PostgresStore(`${name}:`),
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? 'unknown'),
    handler: (req, _res, next) => {
      const resetTime = (req as typeof req & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
      const seconds = Math.max(1, Math.ceil(((resetTime?.getTime() ?? Date.now() + 60_000) - Date.now()) / 1000));
      next(
        new AppError(429, 'too_many_requests', `Too many requests from your network address. Try again in ${waitText(seconds)}.`, {
          retryAfterSeconds: seconds,
        }),
      );
    },
  });
}
