import type { Request, RequestHandler, Response } from 'express';
import type { z } from 'zod';
import { AppError, zodDetails } from './errors';

/** The zod schemas a route parses its request's parts with. */
export type RequestSchemas = { params?: z.ZodType; query?: z.ZodType; body?: z.ZodType };

/** The parsed parts, each typed by the schema that parsed it. */
export type ValidInput<Schemas extends RequestSchemas> = { [Part in keyof Schemas]: Schemas[Part] extends z.ZodType ? z.output<Schemas[Part]> : never };

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

/** Parses the request's parts (params, query, body, in that order) with zod schemas from shared/;
 * 400 with the failing fields. Parsed asynchronously, since some checks (password strength) load
 * their data on first use. */
async function parseRequest<Schemas extends RequestSchemas>(schemas: Schemas, req: Request): Promise<ValidInput<Schemas>> {
  const parsed: Partial<Record<keyof RequestSchemas, unknown>> = {};
  for (const part of ['params', 'query', 'body'] as const) {
    const schema = schemas[part];
    if (!schema) continue;
    const invalid = `Some ${part === 'body' ? 'fields' : part} are not valid`;
    const nul = nulPath(req[part]);
    if (nul !== null) throw new AppError(400, 'validation', invalid, [{ path: nul, message: 'Holds a NUL character (U+0000), which cannot be stored' }]);
    const result = await schema.safeParseAsync(req[part] ?? {});
    if (!result.success) throw new AppError(400, 'validation', invalid, zodDetails(result.error));
    parsed[part] = result.data;
  }
  // Each part was parsed by its own schema just above, which is what ValidInput says of it.
  return parsed as ValidInput<Schemas>;
}

/** The last step of a route: parses the request with `schemas` and calls `handler` with the parsed
 * parts, typed from the schemas, so a route reads `authenticate, allow(...), validated({ body },
 * async ({ body }, req, res) => ...)` without casts. */
export function validated<Schemas extends RequestSchemas>(
  schemas: Schemas,
  handler: (input: ValidInput<Schemas>, req: Request, res: Response) => unknown,
): RequestHandler {
  return async (req, res) => {
    await handler(await parseRequest(schemas, req), req, res);
  };
}
