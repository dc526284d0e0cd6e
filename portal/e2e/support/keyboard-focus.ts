import type { Page } from 'playwright-core';

export type FocusStop = { element: string; outline: string };

/**
 * Tabs through the page from the top, the way a keyboard user would, until focus comes back round (or `maxStops`),
 * and returns every stop whose focus indicator is missing: computed outline style "none" or zero width.
 * Everything focusable by Tab counts: links, buttons, button-links, inputs, radios, disclosures.
 */
export async function stopsWithoutVisibleFocus(
  page: Page,
  { maxStops = 60 } = {},
): Promise<{ stops: number; missing: FocusStop[] }> {
  await page.evaluate(() => {
    (document.activeElement as HTMLElement | null)?.blur();
    window.scrollTo(0, 0);
  });
  const seen = new Set<string>();
  const missing: FocusStop[] = [];
  let stops = 0;
  for (let press = 0; press < maxStops; press += 1) {
    await page.keyboard.press('Tab');
    const stop = await page.evaluate(() => {
      const element = document.activeElement as HTMLElement | null;
      if (!element || element === document.body) return null;
      const style = getComputedStyle(element);
      const name = (element.getAttribute('aria-label') ?? element.textContent ?? '')
        .replace(/\s+/g, ' ')
        .trim()
        .slice(0, 50);
      const path: string[] = [];
      for (let node: Element | null = element; node && node !== document.body; node = node.parentElement) {
        path.unshift(`${node.tagName}:${Array.prototype.indexOf.call(node.parentElement?.children ?? [], node)}`);
      }
      return {
        key: path.join('/'),
        element: `${element.tagName.toLowerCase()}${element.getAttribute('role') ? `[role=${element.getAttribute('role')}]` : ''} "${name}"`,
        outline: `${style.outlineStyle} ${style.outlineWidth} ${style.outlineColor}`,
        visible: style.outlineStyle !== 'none' && parseFloat(style.outlineWidth) > 0,
      };
    });
    if (!stop) continue;
    if (seen.has(stop.key)) break;
    seen.add(stop.key);
    stops += 1;
    if (!stop.visible) missing.push({ element: stop.element, outline: stop.outline });
  }
  return { stops, missing };
}

/** Whether the page is wider than the window (something sticks out sideways on a phone). */
export async function sidewaysOverflow(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
}

/** Where an element sits against the window: fully or partly in view, and its top edge. */
export async function placeInWindow(
  page: Page,
  selector: string,
): Promise<{ top: number; bottom: number; windowHeight: number }> {
  return page.evaluate((css) => {
    const element = document.querySelector(css);
    if (!element) throw new Error(`Nothing matches ${css}`);
    const box = element.getBoundingClientRect();
    return { top: box.top, bottom: box.bottom, windowHeight: window.innerHeight };
  }, selector);
}
