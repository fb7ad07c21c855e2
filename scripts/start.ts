// `npm start`: the project's own PostgreSQL, migrations, the demo seed on an empty database, the
// mail catcher, the client build and the server, all stopped again by Ctrl-C.
import { join, resolve } from 'node:path';
import { PROJECT_DATABASE, useProjectDatabase } from './lib/postgres';
import { buildClientIfStale } from './lib/client-build';

const started = Date.now();
const root = resolve(import.meta.dirname, '..');
const SMTP_PORT = Number(process.env.SMTP_CATCHER_PORT ?? 2525);

const step = (message: string) => console.log(`phaselot: ${message} (${((Date.now() - started) / 1000).toFixed(1)} s)`);

const cluster = await useProjectDatabase(PROJECT_DATABASE.port, PROJECT_DATABASE.name);
step(`PostgreSQL on 127.0.0.1:${PROJECT_DATABASE.port} ${cluster.startedByUs ? 'started' : 'already running'}`);

process.env.SMTP_URL ??= `smtp://127.0.0.1:${SMTP_PORT}`;
process.env.MAIL_CATCHER_DIR ??= join(root, '.data', 'mail');
process.env.UPLOAD_DIR ??= join(root, '.data', 'uploads');

// Imported only now, so that they read the environment set above.
const { sequelize } = await import('../db');
const { migrate } = await import('../db/migrator');
const { seedDemo, isDatabaseEmpty, DEMO_PASSWORD } = await import('../db/seeders/demo');
const { startMailCatcher } = await import('../server/mail/catcher');
const { startServer } = await import('../server/main');
const { startBackgroundWork, stopBackgroundWork } = await import('../server/background');
const { config, isProduction } = await import('../server/config');
const { ROLES } = await import('../shared/schemas/roles');

const applied = await migrate();
step(applied.length ? `applied ${applied.length} migration(s)` : 'schema up to date');

if (!isProduction && (await isDatabaseEmpty())) {
  await seedDemo();
  step('seeded the demo scenario');
}

const catcher = await startMailCatcher({ port: SMTP_PORT, dir: process.env.MAIL_CATCHER_DIR });
step(`mail catcher on smtp://127.0.0.1:${SMTP_PORT}, messages kept in ${catcher.dir}`);

await startBackgroundWork();
step('background jobs started (exports, mail, sweeps)');
step(`client ${await buildClientIfStale()}`);

const server = await startServer();
step(`ready on http://${config.HOST}:${config.PORT}`);
if (!isProduction) {
  console.log(`\nDemo sign-ins (password "${DEMO_PASSWORD}"):`);
  for (const role of ROLES) console.log(`  ${role.padEnd(10)} ${role}@phaselot.test`);
  console.log('\nPress Ctrl-C to stop.');
}

let stopping = false;
async function stop() {
  if (stopping) return;
  stopping = true;
  console.log('\nphaselot: stopping');
  server.closeAllConnections();
  await new Promise((done) => server.close(done));
  await stopBackgroundWork();
  await catcher.close();
  await sequelize.close();
  cluster.stop();
  process.exit(0);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
