// The token-signing secret: required in production, otherwise made once and kept in the data folder.
// Each "start" is a separate Node process that loads the configuration, as `npm start` does.
import { describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import jwt from 'jsonwebtoken';

const root = resolve(import.meta.dirname, '..');
const run = promisify(execFile);

/** Starts a process that loads server/config.ts and prints the secret's use: a token it signs. */
async function start(env: Record<string, string>) {
  const { JWT_SECRET: _ignored, ...inherited } = process.env;
  const code = `const { config } = await import('./server/config.ts');
    const { default: jwt } = await import('jsonwebtoken');
    console.log(jwt.sign({ sub: '1' }, config.JWT_SECRET, { noTimestamp: true }));`;
  const { stdout } = await run(process.execPath, ['--import', 'tsx', '--input-type=module', '-e', code], { cwd: root, env: { ...inherited, ...env } });
  return stdout.trim();
}

describe('the JWT secret', () => {
  it('is generated on the first start without JWT_SECRET, kept private in the data folder and reused on the next', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'phaselot-secret-')), '.data', 'jwt-secret');
    const first = await start({ NODE_ENV: 'development', JWT_SECRET_FILE: file });
    const secret = readFileSync(file, 'utf8').trim();
    expect(secret.length).toBeGreaterThanOrEqual(64);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(() => jwt.verify(first, secret)).not.toThrow();
    // A restart signs with the same secret, so sessions survive it.
    expect(await start({ NODE_ENV: 'development', JWT_SECRET_FILE: file })).toBe(first);
    // Another data folder gets another secret.
    const elsewhere = join(mkdtempSync(join(tmpdir(), 'phaselot-secret-')), 'jwt-secret');
    expect(await start({ NODE_ENV: 'development', JWT_SECRET_FILE: elsewhere })).not.toBe(first);
  });

  it('is one secret when several processes start at once on an empty folder', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'phaselot-secret-')), 'jwt-secret');
    const tokens = await Promise.all(Array.from({ length: 4 }, () => start({ NODE_ENV: 'development', JWT_SECRET_FILE: file })));
    expect(new Set(tokens).size).toBe(1);
  });

  it('comes from JWT_SECRET when it is set, and production refuses to start without it', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'phaselot-secret-')), 'jwt-secret');
    const token = await start({ NODE_ENV: 'development', JWT_SECRET: 'a-secret-given-by-the-operator', JWT_SECRET_FILE: file });
    expect(() => jwt.verify(token, 'a-secret-given-by-the-operator')).not.toThrow();
    expect(() => statSync(file)).toThrow();
    await expect(start({ NODE_ENV: 'production', JWT_SECRET_FILE: file })).rejects.toThrow(/JWT_SECRET must be set/);
  });

  it('refuses a damaged secret file with a clear message', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'phaselot-secret-')), 'jwt-secret');
    writeFileSync(file, 'short\n');
    await expect(start({ NODE_ENV: 'development', JWT_SECRET_FILE: file })).rejects.toThrow(/holds no usable secret .* delete it and start again/);
  });
});
