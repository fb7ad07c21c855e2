// Serves the API and the built client: `npm start` calls startServer; `npm run dev:server` runs this
// file, which also works the background jobs (as every server process does) and stops both on SIGTERM.
import type { Server } from 'node:http';
import { sequelize } from '../db';
import { checkAppRole } from '../db/roles';
import { config, isProduction } from './config';
import { createApp } from './app';
import { startBackgroundWork, stopBackgroundWork } from './background';
import { logger } from './logger';

/** A connection that could switch off the audit triggers is refused in production and warned about elsewhere. */
async function checkDatabaseRole() {
  const { problem } = await checkAppRole(sequelize);
  if (problem && isProduction) throw new Error(`Refusing to start: ${problem}`);
  if (problem) logger.warn(problem);
}

export async function startServer(port = config.PORT, host = config.HOST): Promise<Server> {
  await checkDatabaseRole();
  const app = createApp();
  return new Promise((resolve, reject) => {
    const server = app.listen(port, host, () => resolve(server));
    server.once('error', reject);
  });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const server = await startServer();
  await startBackgroundWork();
  logger.info(`Phaselot listening on http://${config.HOST}:${config.PORT}`);
  process.on('SIGTERM', async () => {
    server.close();
    // A job still running is handed back to the queue, which retries it in another process.
    await stopBackgroundWork();
    process.exit(0);
  });
}
