import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newPage, shot, signIn, startE2E, type E2E } from './support/harness';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(() => e2e?.stop());

describe('each demo role signs in and lands on a home made for it', () => {
  it('owner sees the studio home with the rail', async () => {
    const { page, context } = await newPage(e2e);
    await signIn(page, 'owner@demo.test');
    await expect.poll(() => page.url()).toMatch(/\/studio\/\d+/);
    await page.getByRole('heading', { name: /Hello, Wren/ }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Studio' });
    await nav.getByRole('link', { name: 'Clients' }).waitFor();
    await nav.getByRole('link', { name: 'Settings' }).waitFor();
    expect(await page.title()).toMatch(/Sablework/);
    await shot(page, 'owner-home');
    await context.close();
  });

  it('painter sees the bench home without owner-only items', async () => {
    const { page, context } = await newPage(e2e);
    await signIn(page, 'painter@demo.test');
    await page.getByRole('heading', { name: /Hello, Tobin/ }).waitFor();
    const nav = page.getByRole('navigation', { name: 'Studio' });
    await nav.getByRole('link', { name: 'Clients' }).waitFor();
    expect(await nav.getByRole('link', { name: 'Settings' }).count()).toBe(0);
    await context.close();
  });

  it('client sees their commissions, with no studio rail (phone width)', async () => {
    const { page, context } = await newPage(e2e, { phone: true });
    await signIn(page, 'client@demo.test');
    await page.getByRole('heading', { name: 'My commissions' }).waitFor();
    expect(await page.getByRole('navigation', { name: 'Studio' }).count()).toBe(0);
    await shot(page, 'client-home-phone');
    await context.close();
  });
});

describe('inviting a client by e-mail', () => {
  it('the owner invites, the mail arrives in /dev/mail, the client sets a password and signs in', async () => {
    const { page, context } = await newPage(e2e);
    await signIn(page, 'owner@demo.test');
    await page.getByRole('navigation', { name: 'Studio' }).getByRole('link', { name: 'Clients' }).click();
    await page.getByRole('link', { name: 'Add client' }).first().click();
    await page.getByLabel('Name', { exact: true }).fill('Juniper Vell');
    await page.getByLabel(/^E-mail/).fill('juniper.vell@demo.test');
    await page.getByRole('button', { name: 'Add client' }).click();
    await page.getByRole('button', { name: 'Invite to portal' }).click();
    await page.getByText(/invitation/i).first().waitFor();

    // The local inbox: find the message and follow its link.
    let link: string | null = null;
    for (let i = 0; i < 50 && !link; i++) {
      await page.goto('/dev/mail');
      const row = page.getByRole('link', { name: /Marrowgate Paintworks invites you/ });
      if (await row.count()) {
        await row.first().click();
        link = await page.getByRole('link', { name: /\/invite\// }).first().getAttribute('href');
      } else await page.waitForTimeout(200);
    }
    expect(link).toMatch(/\/invite\/[A-Za-z0-9_-]+$/);
    await context.close();

    const visitor = await newPage(e2e);
    await visitor.page.goto(link!);
    await visitor.page.getByLabel('Your name').fill('Juniper Vell');
    await visitor.page.getByLabel('Choose a password').fill('my own secret brush');
    await visitor.page.getByRole('button', { name: /Accept and create my account/ }).click();
    await visitor.page.getByRole('heading', { name: 'My commissions' }).waitFor();
    await visitor.page.getByRole('button', { name: 'Sign out' }).click();
    await visitor.page.waitForURL(/\/sign-in/);
    await signIn(visitor.page, 'juniper.vell@demo.test', 'my own secret brush');
    await visitor.page.getByRole('heading', { name: 'My commissions' }).waitFor();
    await visitor.context.close();
  });
});
