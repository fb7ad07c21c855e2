import express from 'express';
import cookieParser from 'cookie-parser';
import { pinoHttp } from 'pino-http';
import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { Logger } from 'pino';
import { logger as defaultLogger } from './logger';
import { apiRouter } from './routes';
import { errorHandler, JSON_LIMIT, notFoundHandler } from './http/errors';
import { stopWhenAbandoned } from './http/abandoned';
import { securityHeaders } from './http/headers';
import { sameOriginChanges } from './http/origin';

const clientDir = resolve(import.meta.dirname, '..', 'dist');

export function createApp(options: { logger?: Logger } = {}) {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(securityHeaders);
  app.use(
    pinoHttp({
      logger: options.logger ?? defaultLogger,
      genReqId: (req, res) => {
        const id = (req.headers['x-request-id'] as string | undefined)?.slice(0, 64) || randomUUID();
        res.setHeader('x-request-id', id);
        return id;
      },
    }),
  );
  app.use(stopWhenAbandoned);
  app.use(express.json({ limit: JSON_LIMIT }));
  app.use(cookieParser());
  app.use(sameOriginChanges);
  app.use('/api', apiRouter, notFoundHandler);
  if (existsSync(clientDir)) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    // Client-side routes all load the single page.
    app.get(/^\/(?!api\/).*/, (_req, res) => res.sendFile(join(clientDir, 'index.html')));
  }
  app.use(errorHandler);
  return app;
}
