import type { Page } from 'playwright-core';

// The functions below run inside the page (strings: the tests' TypeScript has no DOM types).

/** Waits until the page has drawn its content: a heading, and no loading line left. */
export async function settle(page: Page): Promise<void> {
  await page.getByRole('heading').first().waitFor();
  // (waitForFunction would evaluate a string inside the page, which the app's CSP refuses.)
  await page.getByRole('status').filter({ hasText: /Loading|Checking/ }).first().waitFor({ state: 'detached' });
  // Web fonts change widths; measure after they are in.
  await page.evaluate(`document.fonts.ready.then(() => undefined)`);
}

/** How far the document is wider than the viewport, in CSS pixels (0 when it fits). */
export async function overflowPx(page: Page): Promise<number> {
  return (await page.evaluate(`Math.max(document.documentElement.scrollWidth, document.body.scrollWidth) - window.innerWidth`)) as number;
}

/** The elements that reach past the viewport, named for a failing test's output. */
export async function widestElements(page: Page): Promise<string[]> {
  return (await page.evaluate(`Array.from(document.querySelectorAll('body *'))
    .filter((el) => el.getBoundingClientRect().right > window.innerWidth + 1)
    .slice(0, 8)
    .map((el) => el.tagName.toLowerCase() + '.' + String(el.className).slice(0, 60) + ' right=' + Math.round(el.getBoundingClientRect().right))`)) as string[];
}

/**
 * Buttons, links, checkboxes and selects whose touch area is smaller than `minPx` on a side.
 * An input inside its label counts the label; a "stretched" link (an absolutely placed
 * ::after) counts the card it covers; links inside running text are exempt (WCAG 2.2 SC 2.5.8).
 */
export async function smallTouchTargets(page: Page, minPx: number): Promise<string[]> {
  return (await page.evaluate(`(() => {
    const min = ${Number(minPx)};
    const found = [];
    for (const el of document.querySelectorAll('button, a[href], input, select, textarea, [role="button"]')) {
      const box = el.getBoundingClientRect();
      if (box.width === 0 && box.height === 0) continue;
      const label = el.closest('label');
      const after = getComputedStyle(el, '::after');
      const stretched = after.content !== 'none' && after.position === 'absolute' && el.offsetParent;
      const hit = label && el.tagName === 'INPUT' ? label.getBoundingClientRect() : stretched ? el.offsetParent.getBoundingClientRect() : box;
      if (el.tagName === 'A' && el.closest('p, li') && getComputedStyle(el).display === 'inline') continue;
      if (hit.width < min - 0.5 || hit.height < min - 0.5) {
        const name = (el.textContent || el.getAttribute('aria-label') || el.getAttribute('name') || '').trim().slice(0, 30);
        found.push(el.tagName.toLowerCase() + (el.getAttribute('type') ? '[' + el.getAttribute('type') + ']' : '') + ' "' + name + '" ' + Math.round(hit.width) + 'x' + Math.round(hit.height));
      }
    }
    return found;
  })()`)) as string[];
}
