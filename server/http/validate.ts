import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { AppError, zodDetails } from './errors';

type Schemas = { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType };

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      valid: { body?: unknown; query?: unknown; params?: unknown };
    }
  }
}

/** Where in a request part a text holds NUL (U+0000), which PostgreSQL's text cannot store. */
function nulPath(value: unknown, path: string[] = []): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path.join('.') : null;
  if (value === null || typeof value !== 'object') return null;
  for (const [key, inner] of Object.entries(value)) {
    const found = key.includes('\u0000') ? [...path, key].join('.') : nulPath(inner, [...path, key]);
    if (found !== null) return found;
  }
  return null;
}

/** Parses the request's parts with zod schemas from shared/; 400 with the failing fields.
 * Parsed asynchronously, since some checks (password strength) load their data on first use. */
export function validate(schemas: Schemas): RequestHandler {
  return async (req, _res, next) => {
    req.valid = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
      const nul = nulPath(req[part]);
      if (nul !== null) {
        next(new AppError(400, 'validation', `Some ${part === 'body' ? 'fields' : part} are not valid`, [{ path: nul, message: 'Holds a NUL character (U+0000), which cannot be stored' }]));
        return;
      }
      const result = await schema.safeParseAsync(req[part] ?? {});
      if (!result.success) {
        next(new AppError(400, 'validation', `Some ${part === 'body' ? 'fields' : part} are not valid`, zodDetails(result.error)));
        return;
      }
      req.valid[part] = result.data;
    }
    next();
  };
}
