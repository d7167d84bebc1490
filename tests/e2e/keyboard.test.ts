import type { Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, shot, startE2E, type E2E } from './support/harness';

// Keyboard alone: every control is reached with Tab or Shift+Tab and worked with Enter, Space and the arrow
// keys. No mouse call anywhere in this file; page.goto and goBack only where a person would use the address bar.

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(() => e2e?.stop());

async function keyboardPage(phone = false) {
  const context = await e2e.browser.newContext({ baseURL: e2e.baseUrl, viewport: phone ? { width: 390, height: 844 } : { width: 1280, height: 900 } });
  const page = await context.newPage();
  page.setDefaultTimeout(15_000);
  return { context, page };
}

/** expect.poll with room for a slow, shared machine (vitest's default gives up after one second). */
const poll = <T>(fn: () => T | Promise<T>, message?: string) => expect.poll(fn, { timeout: 15_000, message });

const isFocused = (target: Locator) => target.evaluate((el) => el === document.activeElement).catch(() => false);

/** What has focus, for failure messages: tag, accessible-ish name. */
const describeFocus = (page: Page) =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return 'nothing (the page body)';
    return `<${el.tagName.toLowerCase()}> ${el.getAttribute('aria-label') ?? el.textContent?.trim().slice(0, 60) ?? ''}`;
  });

/**
 * Presses Tab (or Shift+Tab) until `target` has focus and checks the focus is visible on it.
 * Fails when it is not reached within `max` presses: a control a keyboard cannot get to.
 */
async function tabTo(page: Page, target: Locator, { back = false, max = 120 } = {}) {
  await target.waitFor();
  for (let i = 0; i <= max; i++) {
    if (await isFocused(target)) {
      await expectVisibleFocus(page);
      return i;
    }
    await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
  }
  throw new Error(`Not reached with ${back ? 'Shift+Tab' : 'Tab'} in ${max} presses: ${target}; focus is on ${await describeFocus(page)}`);
}

/** The focused element matches :focus-visible and draws an outline (or a ring) that is not 'none'. */
async function expectVisibleFocus(page: Page) {
  const f = await page.evaluate(() => {
    const el = document.activeElement as HTMLElement;
    const s = getComputedStyle(el);
    return { visible: el.matches(':focus-visible'), outline: `${s.outlineStyle} ${s.outlineWidth} ${s.outlineColor}`, shadow: s.boxShadow, what: `<${el.tagName.toLowerCase()}> ${el.getAttribute('aria-label') ?? el.textContent?.trim().slice(0, 40)}` };
  });
  const drawn = (!f.outline.startsWith('none') && parseFloat(f.outline.split(' ')[1]) >= 2) || (f.shadow !== 'none' && f.shadow !== '');
  expect({ what: f.what, visible: f.visible, drawn }, `focus style of ${f.what}: outline ${f.outline}, box-shadow ${f.shadow}`).toEqual({ what: f.what, visible: true, drawn: true });
}

async function expectFocusOn(page: Page, target: Locator) {
  await poll(() => isFocused(target), `focus should be on ${target}`).toBe(true);
  await expectVisibleFocus(page);
}

/** Signs in by typing: Tab to the e-mail field, type, Tab, type, Enter. */
async function keyboardSignIn(page: Page, email: string) {
  await page.goto('/sign-in');
  await tabTo(page, page.getByLabel('E-mail'));
  await page.keyboard.type(email);
  await page.keyboard.press('Tab');
  await expectFocusOn(page, page.getByLabel('Password', { exact: true }));
  await page.keyboard.type(DEMO_PASSWORD);
  await page.keyboard.press('Enter');
  await page.waitForURL(/\/studio\/\d+$/);
}

const param = (page: Page, key: string) => new URL(page.url()).searchParams.get(key);

/** Waits until the address has `key` like `want` and the control shows the same value (the screen has caught up). */
async function settles(page: Page, key: string, control: Locator, want: RegExp | null) {
  await poll(() => param(page, key)).toEqual(want === null ? null : expect.stringMatching(want));
  await poll(() => control.inputValue()).toBe(param(page, key) ?? '');
}

describe('the bench board by keyboard alone', () => {
  it('skip link, rail, “only my figures”, the three filters, pick up and put back, move a card, mark a stage done, timer, photo dialog, open the commission', async () => {
    const { page, context } = await keyboardPage();
    await keyboardSignIn(page, 'painter@demo.test');
    await page.getByRole('heading', { name: /Hello, Tobin/ }).waitFor();

    // The first Tab reaches "Skip to content"; Enter puts focus on the main area.
    await page.keyboard.press('Tab');
    await expectFocusOn(page, page.getByRole('link', { name: 'Skip to content' }));
    await page.keyboard.press('Enter');
    await poll(() => page.evaluate(() => document.activeElement?.id)).toBe('main');
    // Back up through the rail to Bench, and open it.
    await tabTo(page, page.getByRole('navigation', { name: 'Studio' }).getByRole('link', { name: 'Bench' }), { back: true });
    await page.keyboard.press('Enter');
    const board = page.getByRole('region', { name: 'Bench board' });
    await board.getByRole('article').first().waitFor();
    const cards = () => board.getByRole('article').count();
    const all = await cards();

    // "Only my figures" is a toggle that keeps focus: on, then off again.
    const mine = page.getByRole('button', { name: 'Only my figures' });
    await tabTo(page, mine);
    await page.keyboard.press('Enter');
    await poll(() => param(page, 'painter')).toMatch(/^\d+$/);
    await poll(() => mine.getAttribute('aria-pressed')).toBe('true');
    await expectFocusOn(page, mine);
    await page.keyboard.press('Space');
    await poll(() => param(page, 'painter')).toBeNull();
    await poll(() => mine.getAttribute('aria-pressed')).toBe('false');

    // Painter and commission filters: a closed <select> changes with the arrow keys.
    const painter = page.getByLabel('Painter');
    await tabTo(page, painter);
    await page.keyboard.press('ArrowDown');
    await settles(page, 'painter', painter, /^\d+$/);
    await page.keyboard.press('ArrowUp');
    await settles(page, 'painter', painter, null);

    const commission = page.getByLabel('Commission', { exact: true });
    await tabTo(page, commission);
    await page.keyboard.press('ArrowDown');
    await settles(page, 'commission', commission, /^\d+$/);
    await poll(cards).toBeLessThan(all);
    await page.keyboard.press('ArrowUp');
    await settles(page, 'commission', commission, null);
    await poll(cards).toBe(all);

    // Due date: the up arrow fills each part of the field with today's (whatever order the browser shows them
    // in), the right arrow goes to the next part; Backspace clears a part and the filter with it.
    const due = page.getByLabel('Due on or before');
    await tabTo(page, due);
    for (const key of ['ArrowUp', 'ArrowRight', 'ArrowUp', 'ArrowRight', 'ArrowUp']) await page.keyboard.press(key);
    await settles(page, 'due', due, /^20\d\d-\d\d-\d\d$/);
    await page.keyboard.press('Backspace');
    await settles(page, 'due', due, null);
    await poll(cards).toBe(all);

    // A card: find its drag handle by Tab, lift it with Space, put it back with Escape.
    const card = board.getByRole('article', { name: /Saltmarsh spearmen/ });
    const handle = card.getByRole('button', { name: /^Drag Saltmarsh spearmen to / });
    await tabTo(page, handle);
    const firstTarget = (await handle.getAttribute('aria-label'))!.replace('Drag Saltmarsh spearmen to ', '');
    const live = page.locator('[id^=DndLiveRegion]');
    const lifted = () => handle.getAttribute('aria-pressed');
    await page.keyboard.press('Space');
    await poll(lifted).toBe('true');
    await page.keyboard.press('Escape');
    await poll(() => live.textContent()).toMatch(/cancelled/);
    await poll(lifted).toBeNull();
    // Lift, over the next stage, back (left arrow), drop: it stays where it was.
    await page.keyboard.press('Space');
    await poll(lifted).toBe('true');
    await page.keyboard.press('ArrowRight');
    await poll(() => live.textContent()).toMatch(new RegExp(`over ${firstTarget}`));
    await page.keyboard.press('ArrowLeft');
    await poll(() => live.textContent()).toMatch(/is back over/);
    await page.keyboard.press('Space');
    await poll(() => live.textContent()).toMatch(/stays at/);
    await expect(handle.getAttribute('aria-label')).resolves.toBe(`Drag Saltmarsh spearmen to ${firstTarget}`);
    await expectFocusOn(page, handle);
    // Lift, right arrow, drop: the card moves on one stage and focus stays on its handle in the new column.
    await page.keyboard.press('Space');
    await poll(lifted).toBe('true');
    await page.keyboard.press('ArrowRight');
    await poll(() => live.textContent()).toMatch(new RegExp(`over ${firstTarget}`));
    await page.keyboard.press('Space');
    const movedHandle = card.getByRole('button', { name: /^Drag Saltmarsh spearmen to / }).and(page.locator(`:not([aria-label="Drag Saltmarsh spearmen to ${firstTarget}"])`));
    await movedHandle.waitFor();
    await poll(() => card.locator('xpath=ancestor::section[1]/h2').textContent()).toContain(firstTarget);
    await expectFocusOn(page, movedHandle);

    // "… done" on the same card: Enter marks the stage done; focus follows the card to its next column.
    const done = card.getByRole('button', { name: /^Mark .* done for Saltmarsh spearmen/ });
    await tabTo(page, done);
    const doneName = (await done.getAttribute('aria-label'))!;
    await page.keyboard.press('Enter');
    const nextDone = card.getByRole('button', { name: /^Mark .* done for Saltmarsh spearmen/ }).and(page.locator(`:not([aria-label="${doneName}"])`));
    await nextDone.waitFor();
    await expectFocusOn(page, nextDone);

    // The timer on that stage: Enter starts it (the header shows it), Space stops it; focus stays on the button.
    const start = card.getByRole('button', { name: /^Start the timer on .* of Saltmarsh spearmen/ });
    await tabTo(page, start);
    await page.keyboard.press('Enter');
    const stop = card.getByRole('button', { name: /^Stop the timer on .* of Saltmarsh spearmen/ });
    await stop.waitFor();
    await page.getByRole('group', { name: 'Running timer' }).getByRole('button', { name: /of Saltmarsh spearmen/ }).waitFor();
    await expectFocusOn(page, stop);
    await shot(page, 'keyboard-bench-timer');
    await page.keyboard.press('Space');
    await start.waitFor();
    await expectFocusOn(page, start);

    // The photo dialog: Enter opens it with focus inside, Tab stays inside, Escape closes it and focus returns.
    const photo = card.getByRole('button', { name: 'Add a photo of Saltmarsh spearmen' });
    await tabTo(page, photo);
    await page.keyboard.press('Enter');
    const dialog = page.getByRole('dialog', { name: 'Photo of Saltmarsh spearmen' });
    await dialog.waitFor();
    const inDialog = () => dialog.evaluate((d) => d.contains(document.activeElement));
    await poll(inDialog).toBe(true);
    for (let i = 0; i < 12; i++) {
      await page.keyboard.press('Tab');
      expect(await inDialog(), `Tab ${i + 1} left the dialog for ${await describeFocus(page)}`).toBe(true);
    }
    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'hidden' });
    await expectFocusOn(page, photo);

    // Back up to the card's commission link and open it.
    const link = card.getByRole('link');
    const title = (await link.textContent())!.trim();
    await tabTo(page, link, { back: true });
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { level: 1, name: title }).waitFor();
    await context.close();
  }, 240_000);
});

describe('the calendar (timeline and queue) by keyboard alone', () => {
  it('earlier, this week, later, how many weeks, scrolling the timeline, opening a bar, reordering the queue by buttons and by handle, the hours field, the calendar feed', async () => {
    const { page, context } = await keyboardPage();
    await keyboardSignIn(page, 'owner@demo.test');
    await tabTo(page, page.getByRole('navigation', { name: 'Studio' }).getByRole('link', { name: 'Calendar' }));
    await page.keyboard.press('Enter');
    const bars = page.getByRole('list', { name: 'Commissions in queue order' });
    await bars.getByRole('link').first().waitFor();

    // The range: Earlier and Later shift the window, This week goes back; focus stays on each button.
    const earlier = page.getByRole('button', { name: 'Earlier' });
    await tabTo(page, earlier);
    await page.keyboard.press('Enter');
    await poll(() => param(page, 'from')).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    await expectFocusOn(page, earlier);
    const before = param(page, 'from')!;
    const thisWeek = page.getByRole('button', { name: 'This week' });
    await tabTo(page, thisWeek);
    await page.keyboard.press('Enter');
    await poll(() => param(page, 'from')).toBeNull();
    await expectFocusOn(page, thisWeek);
    const later = page.getByRole('button', { name: 'Later' });
    await tabTo(page, later);
    await page.keyboard.press('Space');
    await poll(() => param(page, 'from')).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    expect(param(page, 'from')! > before).toBe(true);
    await expectFocusOn(page, later);
    await tabTo(page, thisWeek, { back: true });
    await page.keyboard.press('Enter');
    await poll(() => param(page, 'from')).toBeNull();

    // How many weeks: arrow keys on the select; 26 weeks is wider than the screen.
    const weeks = page.getByLabel('Show');
    await tabTo(page, weeks);
    await page.keyboard.press('ArrowDown');
    await settles(page, 'weeks', weeks, /^13$/);
    await page.keyboard.press('ArrowDown');
    await settles(page, 'weeks', weeks, /^26$/);
    await expectFocusOn(page, weeks);

    // The timeline scrolls sideways with the arrow keys once it has focus.
    const timeline = page.getByRole('region', { name: 'Timeline of the queue' });
    await tabTo(page, timeline);
    const scroll = () => timeline.evaluate((el) => el.scrollLeft);
    expect(await timeline.evaluate((el) => el.scrollWidth > el.clientWidth)).toBe(true);
    for (let i = 0; i < 5; i++) await page.keyboard.press('ArrowRight');
    await poll(scroll).toBeGreaterThan(0);
    for (let i = 0; i < 5; i++) await page.keyboard.press('ArrowLeft');
    await poll(scroll).toBe(0);
    await shot(page, 'keyboard-timeline-focus');

    // Each bar is a link: the next Tab lands on the first one, Enter opens its commission.
    const firstBar = bars.getByRole('link').first();
    await tabTo(page, firstBar, { max: 3 });
    const firstTitle = (await firstBar.getAttribute('aria-label'))!.split(',')[0];
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { level: 1, name: firstTitle }).waitFor();
    await page.goBack();
    await bars.getByRole('link').first().waitFor();

    // The queue: "Move … up" swaps the second into first place; focus stays on that row's buttons.
    const queue = page.getByRole('list', { name: 'Queue', exact: true });
    const order = () => queue.getByRole('listitem').evaluateAll((rows) => rows.map((r) => r.querySelector('a')?.textContent?.trim() ?? ''));
    const start = await order();
    expect(start.length).toBeGreaterThan(2);
    const up = queue.getByRole('button', { name: `Move ${start[1]} up the queue` });
    await tabTo(page, up);
    await page.keyboard.press('Enter');
    await poll(order).toEqual([start[1], start[0], ...start.slice(2)]);
    await poll(() => queue.getAttribute('aria-busy')).toBeNull();
    await expectFocusOn(page, queue.getByRole('button', { name: new RegExp(`^Move ${start[1]} (up|down) the queue$`) }).first());
    // And "down" puts it back.
    const down = queue.getByRole('button', { name: `Move ${start[1]} down the queue` });
    await tabTo(page, down);
    await page.keyboard.press('Enter');
    await poll(order).toEqual(start);
    await poll(() => queue.getAttribute('aria-busy')).toBeNull();
    await expectFocusOn(page, down);

    // The drag handle: Space lifts, the down arrow moves it one place, Space drops; the new order is saved.
    const handle = queue.getByRole('button', { name: `Drag ${start[0]} to another place in the queue` });
    await tabTo(page, handle, { back: true });
    await page.keyboard.press('Space');
    await poll(() => handle.getAttribute('aria-pressed')).toBe('true');
    await page.keyboard.press('ArrowDown');
    await page.waitForTimeout(500); // the list slides the others aside
    await page.keyboard.press('Space');
    await poll(order).toEqual([start[1], start[0], ...start.slice(2)]);
    await poll(() => queue.getAttribute('aria-busy')).toBeNull();
    await expectFocusOn(page, handle);
    await page.reload();
    await poll(order).toEqual([start[1], start[0], ...start.slice(2)]);
    await page.keyboard.press('Tab'); // a fresh page: start again from the top

    // "If booked today": type hours; the forecast answers.
    const hours = page.getByLabel('Hours of bench work');
    await tabTo(page, hours);
    await page.keyboard.press('Control+A');
    await page.keyboard.type('30');
    await expect(hours.inputValue()).resolves.toBe('30');

    // The calendar feed: make the address (focus goes to it), then turn the feed off in the dialog.
    const make = page.getByRole('button', { name: 'Make my calendar address' });
    await tabTo(page, make);
    await page.keyboard.press('Enter');
    const address = page.getByLabel('Your secret calendar address');
    await expectFocusOn(page, address);
    const off = page.getByRole('button', { name: 'Turn the feed off' });
    await tabTo(page, off);
    await page.keyboard.press('Enter');
    const dialog = page.getByRole('dialog', { name: 'Turn your calendar feed off?' });
    await dialog.waitFor();
    await tabTo(page, dialog.getByRole('button', { name: 'Turn it off' }), { max: 5 });
    await page.keyboard.press('Enter');
    await dialog.waitFor({ state: 'hidden' });
    await expectFocusOn(page, make);

    // Working hours and days off: a link in the page's header.
    const hoursLink = page.getByRole('link', { name: 'Working hours and days off' });
    await tabTo(page, hoursLink, { back: true });
    await page.keyboard.press('Enter');
    await page.waitForURL(/\/calendar\/capacity/);
    await context.close();
  }, 240_000);
});
