import type { Page } from 'playwright-core';

export type ScreeningQuestion = {
  key: string;
  label: string;
  kind: 'yes-no' | 'number' | 'choice';
  options?: string[];
  min?: number;
  max?: number;
};

/**
 * An answer that keeps this person eligible for the demo study: yes, the first option, and for a number the value
 * in `numbers` for its key or else a middling one.
 */
export async function answerScreeningQuestion(
  page: Page,
  question: ScreeningQuestion,
  numbers: Record<string, number> = {},
): Promise<void> {
  if (question.kind === 'yes-no') {
    await page.getByRole('radiogroup', { name: question.label }).getByRole('radio', { name: 'Yes' }).click();
  } else if (question.kind === 'number') {
    const low = question.min ?? 0;
    const high = question.max ?? low + 10;
    await page.getByLabel(question.label).fill(String(numbers[question.key] ?? Math.round((low + high) / 2)));
  } else {
    const first = question.options?.[0];
    if (!first) throw new Error(`The choice question "${question.label}" has no options`);
    const group = page.getByRole('radiogroup', { name: question.label });
    if (await group.count()) await group.getByRole('radio', { name: first }).click();
    else {
      await page
        .getByRole('button', { name: new RegExp(question.label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')) })
        .click();
      await page.getByRole('option', { name: first }).click();
    }
  }
}
