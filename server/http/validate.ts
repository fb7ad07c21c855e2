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

/** Parses the request's parts with zod schemas from shared/; 400 with the failing fields.
 * Parsed asynchronously, since some checks (password strength) load their data on first use. */
export function validate(schemas: Schemas): RequestHandler {
  return async (req, _res, next) => {
    req.valid = {};
    for (const part of ['params', 'query', 'body'] as const) {
      const schema = schemas[part];
      if (!schema) continue;
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
