// No signing secret, private key or credentials file is part of the repository: a secret that is
// published signs tokens anyone can forge. Test files may hold made-up secrets for their own use.
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

const root = resolve(import.meta.dirname, '..');
const git = (...args: string[]) => execFileSync('git', args, { cwd: root, encoding: 'utf8' });
const tracked = git('ls-files', '-z').split('\0').filter(Boolean);
const isTest = (path: string) => /\.test\.tsx?$/.test(path) || path.startsWith('tests/');

function textOf(path: string): string | null {
  try {
    const content = readFileSync(join(root, path));
    return content.includes(0) ? null : content.toString('utf8');
  } catch {
    return null; // deleted in the work tree, not yet in a commit
  }
}

/** The tracked files (optionally only those outside tests) whose text matches a pattern. */
function filesMatching(pattern: RegExp, { outsideTests = false } = {}) {
  return tracked.filter((path) => !(outsideTests && isTest(path))).filter((path) => pattern.test(textOf(path) ?? ''));
}

describe('the repository holds no secret', () => {
  it('has no private key', () => {
    expect(filesMatching(new RegExp(['-----BEGIN', '[A-Z ]*PRIVATE KEY-----'].join(' ')))).toEqual([]);
  });

  it('gives JWT_SECRET no literal value or fallback outside tests', () => {
    expect(filesMatching(/JWT_SECRET\s*(?:[:=]|\?\?|\|\|)\s*['"`]/, { outsideTests: true })).toEqual([]);
  });

  it('signs tokens only with the configured secret outside tests', () => {
    expect(filesMatching(/jwt\.sign\([^;]*,\s*['"`][^'"`]+['"`]/, { outsideTests: true })).toEqual([]);
  });

  it('tracks no environment or key files, and keeps the generated secret in an ignored folder', () => {
    expect(tracked.filter((path) => /(^|\/)\.env(\.|$)|\.(pem|key|p12|pfx)$/.test(path))).toEqual([]);
    expect(git('check-ignore', '.data/jwt-secret').trim()).toBe('.data/jwt-secret');
  });
});
