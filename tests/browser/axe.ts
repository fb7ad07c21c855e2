// The accessibility check of a page: axe-core, run inside the page as it is on screen. Browser tests
// call `seriousViolations(page)` and expect an empty list; each entry names the rule and the elements.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import type { AxeResults, ImpactValue } from 'axe-core';

const AXE_SOURCE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');
const BLOCKING: ImpactValue[] = ['serious', 'critical'];

declare global {
  interface Window {
    axe?: { run(context: Document, options: object): Promise<AxeResults> };
  }
}

/** Serious and critical axe-core violations of the page, as "rule (impact): help — selectors". */
export async function seriousViolations(page: Page): Promise<string[]> {
  // A navigation gives the page a fresh window, so the script is added again when it is missing. It
  // is evaluated through the browser's debugging protocol: the app's content security policy refuses
  // script tags it did not serve, and the test must not loosen the policy it checks the app under.
  if (!(await page.evaluate(() => typeof window.axe !== 'undefined'))) await page.evaluate(AXE_SOURCE);
  const results = await page.evaluate(() => window.axe!.run(document, { resultTypes: ['violations'] }));
  return results.violations
    .filter((violation) => violation.impact && BLOCKING.includes(violation.impact))
    .map((violation) => {
      const targets = violation.nodes.slice(0, 5).map((node) => node.target.join(' '));
      const more = violation.nodes.length > 5 ? ` and ${violation.nodes.length - 5} more` : '';
      return `${violation.id} (${violation.impact}): ${violation.help} — ${targets.join(', ')}${more}`;
    });
}
