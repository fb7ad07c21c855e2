// Builds the client with Vite unless dist/ already holds a build of the current sources.
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { build } from 'vite';

const root = resolve(import.meta.dirname, '../..');
const stampFile = join(root, 'dist', '.source-hash');
const INPUTS = ['src', 'shared', 'fonts', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package-lock.json'];

function hashTree(path: string, hash: ReturnType<typeof createHash>) {
  if (statSync(path).isDirectory()) {
    for (const name of readdirSync(path).sort()) {
      if (name.endsWith('.test.ts')) continue;
      hashTree(join(path, name), hash);
    }
  } else {
    hash.update(path).update(readFileSync(path));
  }
}

function sourceHash() {
  const hash = createHash('sha256');
  for (const input of INPUTS) {
    const path = join(root, input);
    if (existsSync(path)) hashTree(path, hash);
  }
  return hash.digest('hex');
}

export async function buildClientIfStale(): Promise<'built' | 'up to date'> {
  const current = sourceHash();
  if (existsSync(stampFile) && readFileSync(stampFile, 'utf8') === current) return 'up to date';
  await build({ root, logLevel: 'warn' });
  writeFileSync(stampFile, current);
  return 'built';
}
