// `npm test`: a fresh test database in the project's test cluster, the mail catcher, the client
// build, then the whole vitest suite (unit, API against PostgreSQL, browser). Extra arguments go
// to vitest, e.g. `npm test -- server/routes/auth`.
import { spawn, spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ensureCluster, ensureDatabase, databaseUrl, dropDatabase, otherDatabasesInUse } from './lib/postgres';
import { buildClientIfStale } from './lib/client-build';

const root = resolve(import.meta.dirname, '..');
const DB_PORT = 54871;
// Each run has its own database, catcher port and folders, so two runs never disturb each other.
const runId = `${process.pid}`;
const database = `phaselot_test_${runId}`;

// The whole suite starts with the lint (layer rules, formatting, types); a run of a part skips it.
const wholeSuite = process.argv.length === 2;
const lintFailed = wholeSuite && spawnSync('npm', ['run', '-s', 'lint'], { cwd: root, stdio: 'inherit' }).status !== 0;
if (lintFailed) console.error('phaselot: npm run lint failed (see above); running the tests all the same');

const cluster = ensureCluster('pg-test', DB_PORT);
await ensureDatabase(DB_PORT, database, { recreate: true });

const runDir = join(root, '.data', 'test-runs', runId);
rmSync(runDir, { recursive: true, force: true });
const mailDir = join(runDir, 'mail');
const { startMailCatcher } = await import('../server/mail/catcher');
const catcher = await startMailCatcher({ port: 0, dir: mailDir });
Object.assign(process.env, {
  NODE_ENV: 'test',
  DATABASE_URL: databaseUrl(DB_PORT, database, 'app'),
  MIGRATION_DATABASE_URL: databaseUrl(DB_PORT, database, 'owner'),
  SMTP_URL: `smtp://127.0.0.1:${catcher.port}`,
  MAIL_CATCHER_DIR: mailDir,
  UPLOAD_DIR: join(runDir, 'uploads'),
  // A signing key of this run only: nothing the tests sign is valid anywhere else.
  JWT_SECRET: randomBytes(32).toString('base64url'),
});

const { sequelize } = await import('../db');
const { migrate } = await import('../db/migrator');
const { seedDemo } = await import('../db/seeders/demo');

await migrate();
await seedDemo();
await sequelize.close();
console.log(`phaselot: client ${await buildClientIfStale()}`);

// Spawned, not run synchronously: the catcher in this process must keep answering meanwhile.
const vitest = spawn(join(root, 'node_modules/.bin/vitest'), ['run', ...process.argv.slice(2)], { stdio: 'inherit', env: process.env });
const exitCode = await new Promise<number>((done) => vitest.on('exit', (code) => done(code ?? 1)));

await catcher.close();
await dropDatabase(DB_PORT, database);
rmSync(runDir, { recursive: true, force: true });
// Another run may still be using the shared test cluster; the last one out stops it.
if (!(await otherDatabasesInUse(DB_PORT, database))) cluster.stop();
process.exit(lintFailed ? exitCode || 1 : exitCode);
