// Every action the server records has its words on the audit trail's page: the action literals in
// server/ are read from the source and looked up in shared/auditWords.ts.
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { ACTION_LABELS, actionWords } from '../../shared/auditWords';

const SERVER = join(__dirname, '..');

function sources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) return sources(path);
    return entry.name.endsWith('.ts') && !entry.name.endsWith('.test.ts') ? [path] : [];
  });
}

describe('audit actions in words', () => {
  it('names every action a recordAudit call writes', () => {
    const missing: string[] = [];
    let found = 0;
    for (const file of sources(SERVER)) {
      const text = readFileSync(file, 'utf8');
      if (!text.includes('recordAudit(')) continue;
      for (const match of text.matchAll(/action: '([a-z-]+\.[a-z.-]+)'/g)) {
        found += 1;
        if (!ACTION_LABELS[match[1]]) missing.push(`${match[1]} (${relative(SERVER, file)})`);
      }
    }
    expect(found).toBeGreaterThan(40);
    expect(missing).toEqual([]);
  });

  it('words the actions built from decisions and stock moves', () => {
    expect(actionWords('disposition.reject')).toBe('Lot decision signed: reject to vendor');
    expect(actionWords('ncr.disposition.return-to-vendor')).toBe('NCR disposition signed: return to vendor');
    expect(actionWords('stock.release')).toBe('Stock move: released to stock');
  });
});
