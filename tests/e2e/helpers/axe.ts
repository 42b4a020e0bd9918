import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

const require = createRequire(import.meta.url);
/** axe-core's browser bundle, evaluated in the page under test (the app's CSP forbids adding a script tag). */
const AXE_SOURCE = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

/**
 * The axe-core rule sets run on every page: WCAG 2.0 to 2.2 A and AA (contrast, names, labels,
 * structure) and axe's best practices for page structure (landmarks, one h1, heading order).
 */
export const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice'];

/** One violation in a form that reads well in a failing test's output. */
export interface AxeFinding {
  rule: string;
  impact: string | null;
  targets: string[];
  summary: string;
}

/** Runs axe-core on the page as it is now and returns its violations (none on a good page). */
export async function axeViolations(page: Page): Promise<AxeFinding[]> {
  if (!(await page.evaluate(`'axe' in window`))) await page.evaluate(AXE_SOURCE);
  const result = (await page.evaluate(
    `axe.run(document, { runOnly: { type: 'tag', values: ${JSON.stringify(AXE_TAGS)} }, resultTypes: ['violations'] })`,
  )) as { violations: { id: string; impact: string | null; nodes: { target: string[]; failureSummary?: string }[] }[] };
  return result.violations.flatMap((v) =>
    v.nodes.map((n) => ({ rule: v.id, impact: v.impact, targets: n.target.map(String), summary: (n.failureSummary ?? '').split('\n').slice(0, 3).join(' ') })),
  );
}
