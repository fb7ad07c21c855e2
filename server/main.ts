// Serves the API and the built client: `npm start` calls startServer; `npm run dev:server` runs this file.
import type { Server } from 'node:http';
import { config } from './config';
import { createApp } from './app';
import { logger } from './logger';

export function startServer(port = config.PORT, host = config.HOST): Promise<Server> {
  const app = createApp();
  return new Promise((resolve, reject) => {
    const server = app.listen(port, host, () => resolve(server));
    server.once('error', reject);
  });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const server = await startServer();
  logger.info(`Phaselot listening on http://${config.HOST}:${config.PORT}`);
  process.on('SIGTERM', () => server.close());
}
