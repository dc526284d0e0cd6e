import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { transitionsSettled } from './browser';

/** Serious and critical WCAG A/AA problems on the page as it stands, one line each. */
export async function seriousAccessibilityProblems(page: Page): Promise<string[]> {
  // Headless UI marks elements with data-transition while they fade in; half-transparent text would fail contrast.
  await transitionsSettled(page);
  const results = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa']).analyze();
  return results.violations
    .filter((violation) => violation.impact === 'serious' || violation.impact === 'critical')
    .map(
      (violation) =>
        `${violation.id}: ${violation.help} (${violation.nodes.map((node) => node.target.join(' ')).join(', ')})`,
    );
}
