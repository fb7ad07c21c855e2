// The layer rules of eslint.config.js, shown failing on deliberate violations (and passing on the
// allowed direction), so a change to the config that silently stops enforcing them is caught.
import { resolve } from 'node:path';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

const root = resolve(import.meta.dirname, '../..');
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: root });
});

async function boundaryErrors(filePath: string, code: string) {
  const [result] = await eslint.lintText(code, { filePath: resolve(root, filePath) });
  return result.messages.filter((m) => m.ruleId === 'boundaries/dependencies' || m.ruleId === 'no-restricted-imports' || m.ruleId === 'no-restricted-globals');
}

describe('layer rules', () => {
  it('refuses an area importing a route module', async () => {
    const errors = await boundaryErrors('server/inspection/probe.ts', "import { apiRouter } from '../routes/index';\nexport const probe = apiRouter;\n");
    expect(errors).toHaveLength(1);
    expect(errors[0].message).toMatch(/"area".*"routes"/);
  });

  it('refuses infrastructure importing an area', async () => {
    const errors = await boundaryErrors('server/http/probe.ts', "import * as stock from '../stock/ledger';\nexport const probe = stock;\n");
    expect(errors).toHaveLength(1);
  });

  it('refuses a route reading the database itself, and a seeder calling a route module', async () => {
    const route = await boundaryErrors('server/routes/probe.ts', "import { Lot } from '../../db/models';\nexport const probe = Lot;\n");
    expect(route).toHaveLength(1);
    expect(route[0].message).toMatch(/"routes".*"db"/);
    const seed = await boundaryErrors('db/seeders/probe.ts', "import { apiRouter } from '../../server/routes/index';\nexport const probe = apiRouter;\n");
    expect(seed).toHaveLength(1);
    expect(seed[0].message).toMatch(/"seed".*"routes"/);
  });

  it('refuses shared/ importing the server or a Node built-in', async () => {
    const errors = await boundaryErrors(
      'shared/probe.ts',
      "import { config } from '../server/config';\nimport { readFileSync } from 'node:fs';\nexport const probe = [config, readFileSync];\n",
    );
    expect(errors.map((e) => e.ruleId).sort()).toEqual(['boundaries/dependencies', 'no-restricted-imports']);
  });

  it('refuses a client feature importing another feature', async () => {
    const errors = await boundaryErrors('src/features/stock/probe.ts', "import * as receiving from '../receiving/api';\nexport const probe = receiving;\n");
    expect(errors).toHaveLength(1);
    expect(errors[0].message).toMatch(/feature="stock".*feature="receiving"/);
  });

  it('allows the directions the layers are meant to have', async () => {
    expect(await boundaryErrors('server/routes/probe.ts', "import * as ledger from '../stock/ledger';\nexport const probe = ledger;\n")).toEqual([]);
    expect(
      await boundaryErrors('db/seeders/probe.ts', "import * as receipts from '../../server/receiving/receipts';\nexport const probe = receipts;\n"),
    ).toEqual([]);
    expect(await boundaryErrors('src/features/stock/probe.ts', "import * as api from '../../lib/api';\nexport const probe = api;\n")).toEqual([]);
  });
});
