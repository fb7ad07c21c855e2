// `npm test`: a fresh test database in the project's test cluster, the mail catcher, the client
// build, then the whole vitest suite (unit, API against PostgreSQL, browser). Extra arguments go
// to vitest, e.g. `npm test -- server/routes/auth`.
import { spawn } from 'node:child_process';
import { rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ensureCluster, ensureDatabase, databaseUrl } from './lib/postgres';
import { buildClientIfStale } from './lib/client-build';

const root = resolve(import.meta.dirname, '..');
const DB_PORT = 54871;
const SMTP_PORT = 2526;

const cluster = ensureCluster('pg-test', DB_PORT);
await ensureDatabase(DB_PORT, 'phaselot_test', { recreate: true });

const mailDir = join(root, '.data', 'test-mail');
rmSync(mailDir, { recursive: true, force: true });
Object.assign(process.env, {
  NODE_ENV: 'test',
  DATABASE_URL: databaseUrl(DB_PORT, 'phaselot_test'),
  SMTP_URL: `smtp://127.0.0.1:${SMTP_PORT}`,
  MAIL_CATCHER_DIR: mailDir,
  UPLOAD_DIR: join(root, '.data', 'test-uploads'),
  TEST_SMTP_PORT: String(SMTP_PORT),
});

const { sequelize } = await import('../db');
const { migrate } = await import('../db/migrator');
const { seedDemo } = await import('../db/seeders/demo');
const { startMailCatcher } = await import('../server/mail/catcher');

await migrate(sequelize);
await seedDemo();
await sequelize.close();
const catcher = await startMailCatcher({ port: SMTP_PORT, dir: mailDir });
console.log(`phaselot: client ${await buildClientIfStale()}`);

// Spawned, not run synchronously: the catcher in this process must keep answering meanwhile.
const vitest = spawn(join(root, 'node_modules/.bin/vitest'), ['run', ...process.argv.slice(2)], { stdio: 'inherit', env: process.env });
const exitCode = await new Promise<number>((done) => vitest.on('exit', (code) => done(code ?? 1)));

await catcher.close();
cluster.stop();
process.exit(exitCode);
