import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { UniqueConstraintError, ForeignKeyConstraintError } from 'sequelize';
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
  logger.error({ err, requestId: req.id }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server', details: { requestId: req.id } } });
};
