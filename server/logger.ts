import pino, { type DestinationStream } from 'pino';
import { config } from './config';

/** Secrets never reach the log: session tokens (bearer header, cookie, Set-Cookie) and any password
 * or token field of a logged object, at the depths pino-http and our own calls put them. */
const REDACTED_PATHS = [
  'req.headers.authorization',
  'req.headers.cookie',
  'res.headers["set-cookie"]',
  'headers.authorization',
  'headers.cookie',
  ...['password', 'currentPassword', 'newPassword', 'token'].flatMap((field) => [field, `*.${field}`, `*.*.${field}`]),
];

export const createLogger = (level: string, destination?: DestinationStream) =>
  pino({ level, redact: { paths: REDACTED_PATHS, censor: '[redacted]' } }, destination);

export const logger = createLogger(config.NODE_ENV === 'test' ? 'silent' : config.LOG_LEVEL);
