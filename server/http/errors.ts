import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { DatabaseError, UniqueConstraintError, ForeignKeyConstraintError } from 'sequelize';
import multer from 'multer';
import { logger } from '../logger';

/** An error the client can act on: it leaves the API as `{error: {code, message, details}}`. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export const badRequest = (message: string, details?: unknown) => new AppError(400, 'bad_request', message, details);
export const unauthorized = (message = 'Sign in to continue') => new AppError(401, 'unauthorized', message);
export const forbidden = (message = 'Your role does not allow this') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'Resource') => new AppError(404, 'not_found', `${what} not found`);
export const conflict = (message: string, details?: unknown) => new AppError(409, 'conflict', message, details);

export function zodDetails(error: ZodError) {
  return error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message }));
}

export const JSON_LIMIT = '2mb';

/** PostgreSQL's refusals of a value that came in with the request (a check at the edge missed it):
 * the client's to fix, not a fault of the server. */
const REFUSED_VALUES: Record<string, string> = {
  '22021': 'A text holds a character that cannot be stored (such as NUL, U+0000)',
  '22P05': 'A text holds a character that cannot be stored',
  '22003': 'A number is out of the range that can be stored',
  '22001': 'A text is longer than can be stored',
  '22007': 'A date or time is not valid',
  '22008': 'A date or time is out of range',
};

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new AppError(404, 'not_found', `No API route ${req.method} ${req.path}`));
};

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (err instanceof AppError) {
    res.status(err.status).json({ error: { code: err.code, message: err.message, details: err.details } });
    return;
  }
  if (err instanceof ZodError) {
    res.status(400).json({ error: { code: 'validation', message: 'Some fields are not valid', details: zodDetails(err) } });
    return;
  }
  if (err instanceof UniqueConstraintError) {
    const fields = err.errors.map((e) => e.path).filter(Boolean);
    res.status(409).json({ error: { code: 'duplicate', message: `Already exists: ${fields.join(', ') || 'record'}`, details: fields } });
    return;
  }
  if (err instanceof ForeignKeyConstraintError) {
    res.status(409).json({ error: { code: 'in_use', message: 'The record is referenced by other records' } });
    return;
  }
  if (err instanceof multer.MulterError) {
    const status = err.code === 'LIMIT_FILE_SIZE' ? 413 : 400;
    res.status(status).json({ error: { code: 'upload', message: err.message, details: { field: err.field } } });
    return;
  }
  if (err?.type === 'entity.parse.failed') {
    res.status(400).json({ error: { code: 'bad_json', message: 'The request body is not valid JSON' } });
    return;
  }
  if (err?.type === 'entity.too.large') {
    res.status(413).json({ error: { code: 'too_large', message: `The request body is larger than the ${JSON_LIMIT} allowed; send files as uploads` } });
    return;
  }
  // Other refusals of the body parser (unknown charset or encoding) carry their own 4xx status.
  if (err?.expose && err.status >= 400 && err.status < 500) {
    res.status(err.status).json({ error: { code: 'bad_request', message: err.message } });
    return;
  }
  // PostgreSQL stopped the statement: it ran past STATEMENT_TIMEOUT_SECONDS (or its client left, and nobody reads this).
  if (err instanceof DatabaseError && (err.parent as { code?: string }).code === '57014') {
    res
      .status(503)
      .json({ error: { code: 'timeout', message: 'The server stopped this request: it took longer than allowed. Narrow it down and try again.' } });
    return;
  }
  const refused = err instanceof DatabaseError ? REFUSED_VALUES[(err.parent as { code?: string }).code ?? ''] : undefined;
  if (refused) {
    res.status(400).json({ error: { code: 'bad_value', message: refused } });
    return;
  }
  logger.error({ err, requestId: req.id }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server', details: { requestId: req.id } } });
};
