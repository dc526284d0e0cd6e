import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';

/** Serious and critical axe-core findings on the page as it stands, as short readable lines. */
export async function seriousAccessibilityProblems(page: Page): Promise<string[]> {
  const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa']).analyze();
  return results.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .map(
      (violation) =>
        `${violation.id}: ${violation.help} (${violation.nodes.map((node) => node.target.join(' ')).join(', ')})`,
    );
}
