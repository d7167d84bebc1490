import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newPage, signIn, startE2E, type E2E } from './support/harness';

// WCAG 2.0 and 2.1, levels A and AA: the rules axe files under these tags.
const TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

let e2e: E2E;
let studioId = '';
/** Ids of demo records to open, looked up once through the owner's session. */
const ids = { commission: 0, draftQuote: 0, invoice: 0, recipe: 0 };

/** Calls the API from the signed-in page's own session. */
async function api(page: Page, url: string) {
  const res = await page.request.get(url);
  if (!res.ok()) throw new Error(`GET ${url}: ${res.status()} ${await res.text()}`);
  return res.json();
}
const itemsOf = (body: unknown): { id: number; status?: string; title?: string; name?: string }[] => (Array.isArray(body) ? body : (body as { items: never[] }).items);

beforeAll(async () => {
  e2e = await startE2E();
  const owner = await newPage(e2e);
  await signIn(owner.page, 'owner@demo.test');
  await owner.page.waitForURL(/\/studio\/\d+/);
  studioId = owner.page.url().match(/\/studio\/(\d+)/)![1];
  const s = `/api/studios/${studioId}`;
  ids.commission = itemsOf(await api(owner.page, `${s}/commissions?q=Bog-lantern`))[0].id;
  ids.draftQuote = itemsOf(await api(owner.page, `${s}/quotes?status=draft`))[0].id;
  ids.invoice = itemsOf(await api(owner.page, `${s}/invoices`))[0].id;
  ids.recipe = itemsOf(await api(owner.page, `${s}/recipes`))[0].id;
  await owner.context.close();
});
afterAll(() => e2e?.stop());

type Finding = { page: string; id: string; impact: string; help: string; targets: string[] };

/**
 * Waits until the screen has its heading and its data (no "Loading…" left in the main area), then runs axe.
 * Returns the serious and critical findings, each with the rule id, where it is and what axe says to do.
 */
async function scan(page: Page, name: string, ready: () => Promise<unknown>): Promise<Finding[]> {
  const t0 = Date.now();
  await page.getByRole('heading', { level: 1 }).first().waitFor({ state: 'visible' });
  await ready();
  await expect.poll(() => page.locator('main [role=status]').filter({ hasText: /Loading|Working out/ }).count(), { timeout: 15_000 }).toBe(0);
  await page.waitForLoadState('networkidle');
  // Still the screen that was asked for (a render error would leave only the error card to scan).
  const intact = await page.evaluate(() => !!document.querySelector('main h1') && !document.body.innerText.includes('This screen stopped working'));
  if (!intact) throw new Error(`${name}: the screen did not render (no heading in <main>, or the error card) at ${page.url()}`);
  const t1 = Date.now();
  // Only violations come back (passes and incomplete are not serialised), which keeps a scan quick.
  const results = await new AxeBuilder({ page }).withTags(TAGS).options({ resultTypes: ['violations'] }).analyze();
  // A11Y_TIMES=1 prints how long each screen took to load and to scan.
  if (process.env.A11Y_TIMES) console.log(`${name}: ready ${t1 - t0} ms, axe ${Date.now() - t1} ms`);
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => ({ page: name, id: v.id, impact: v.impact!, help: `${v.help} (${v.helpUrl})`, targets: v.nodes.slice(0, 6).map((n) => `${n.target.join(' ')} — ${n.failureSummary?.split('\n').slice(1, 2).join('').trim() ?? ''}`) }));
}

function report(findings: Finding[]): string {
  return findings.map((f) => `\n[${f.page}] ${f.id} (${f.impact}): ${f.help}\n    ${f.targets.join('\n    ')}`).join('');
}

const main = (page: Page) => page.locator('main');

describe('no serious or critical axe findings (WCAG 2.1 A and AA)', () => {
  it('sign-in and the owner’s screens: home, bench, commission, quote editor, invoice, paints, recipe, timeline', async () => {
    const { page, context } = await newPage(e2e);
    const found: Finding[] = [];
    const at = `/studio/${studioId}`;

    await page.goto('/sign-in');
    found.push(...(await scan(page, 'sign-in', () => page.getByLabel('E-mail').waitFor())));

    await signIn(page, 'owner@demo.test');
    await page.waitForURL(/\/studio\/\d+$/);
    found.push(...(await scan(page, 'owner home', () => page.getByRole('heading', { name: /Hello, Wren/ }).waitFor())));

    await page.goto(`${at}/bench`);
    found.push(...(await scan(page, 'bench board', () => page.getByRole('region', { name: 'Bench board' }).getByRole('article').first().waitFor())));

    await page.goto(`${at}/commissions/${ids.commission}`);
    found.push(...(await scan(page, 'commission', () => page.getByRole('heading', { name: /Bog-lantern goblin warband/, level: 1 }).waitFor())));

    await page.goto(`${at}/quotes/${ids.draftQuote}`);
    found.push(...(await scan(page, 'quote editor', () => main(page).getByRole('button', { name: /send/i }).first().waitFor())));

    await page.goto(`${at}/invoices/${ids.invoice}`);
    found.push(...(await scan(page, 'invoice', () => main(page).getByRole('table').first().waitFor())));

    await page.goto(`${at}/paints`);
    found.push(...(await scan(page, 'paint rack', () => main(page).getByRole('table').first().waitFor())));

    await page.goto(`${at}/paints/recipes/${ids.recipe}`);
    found.push(...(await scan(page, 'recipe', () => main(page).getByRole('list').first().waitFor())));

    await page.goto(`${at}/calendar`);
    found.push(...(await scan(page, 'timeline', () => page.getByRole('list', { name: 'Commissions in queue order' }).getByRole('link').first().waitFor())));

    // The account screen, reached from the top bar, with a field error showing (a wrong current password).
    await page.goto(at);
    await page.getByRole('link', { name: /Your account/ }).click();
    await page.getByLabel('Current password').fill('not the password at all');
    await page.getByLabel('New password', { exact: true }).fill('a long enough new one');
    await page.getByLabel('New password again').fill('a long enough new one');
    await page.getByRole('button', { name: 'Change password' }).click();
    found.push(...(await scan(page, 'account, with a field error', () => page.getByText('That is not your current password.').waitFor())));

    await context.close();
    expect(found, report(found)).toEqual([]);
  }, 300_000);

  it('the client’s home and commission, and the public studio page', async () => {
    const { page, context } = await newPage(e2e);
    const found: Finding[] = [];
    await signIn(page, 'client@demo.test');
    found.push(...(await scan(page, 'client home', () => page.getByRole('heading', { name: 'My commissions' }).waitFor())));

    await page.getByRole('link', { name: /Bog-lantern goblin warband/ }).first().click();
    found.push(...(await scan(page, 'client commission', () => page.getByRole('heading', { name: /Bog-lantern goblin warband/, level: 1 }).waitFor())));
    await context.close();

    const visitor = await newPage(e2e);
    await visitor.page.goto('/s/marrowgate');
    found.push(...(await scan(visitor.page, 'public studio page', () => visitor.page.getByRole('heading', { name: /Marrowgate Paintworks/ }).first().waitFor())));
    await visitor.context.close();
    expect(found, report(found)).toEqual([]);
  }, 300_000);

  it('at phone width: sign-in, the client’s commission and the bench board', async () => {
    const found: Finding[] = [];
    const client = await newPage(e2e, { phone: true });
    await client.page.goto('/sign-in');
    found.push(...(await scan(client.page, 'phone sign-in', () => client.page.getByLabel('E-mail').waitFor())));
    await signIn(client.page, 'client@demo.test');
    await client.page.getByRole('link', { name: /Bog-lantern goblin warband/ }).first().click();
    found.push(...(await scan(client.page, 'phone client commission', () => client.page.getByRole('heading', { name: /Bog-lantern goblin warband/, level: 1 }).waitFor())));
    await client.context.close();

    const painter = await newPage(e2e, { phone: true });
    await signIn(painter.page, 'painter@demo.test');
    await painter.page.waitForURL(/\/studio\/\d+$/);
    await painter.page.goto(`/studio/${studioId}/bench`);
    found.push(...(await scan(painter.page, 'phone bench board', () => painter.page.getByRole('region', { name: 'Bench board' }).getByRole('article').first().waitFor())));
    // The bottom bar holds four entries and "More"; nothing on the page runs off the phone's edge.
    const bar = painter.page.getByRole('navigation', { name: 'Studio' });
    const more = bar.getByRole('button', { name: 'More' });
    expect(await painter.page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
    await more.click();
    found.push(...(await scan(painter.page, 'phone studio menu', () => bar.getByRole('link', { name: 'Calendar' }).waitFor())));
    await painter.page.keyboard.press('Escape');
    expect(await more.getAttribute('aria-expanded')).toBe('false');
    expect(await more.evaluate((el) => el === document.activeElement)).toBe(true);
    await more.click();
    await bar.getByRole('link', { name: 'Paints & recipes' }).click();
    await painter.page.waitForURL(/\/paints$/);
    // the panel closes as the new screen renders (a moment after the address changes)
    await painter.page.waitForFunction(() => document.querySelector('nav[aria-label="Studio"] button[aria-expanded]')?.getAttribute('aria-expanded') === 'false', undefined, { timeout: 5_000 });
    await painter.context.close();
    expect(found, report(found)).toEqual([]);
  }, 300_000);
});
