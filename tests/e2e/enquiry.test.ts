import { afterAll, beforeAll, describe, it } from 'vitest';
import { newPage, shot, signIn, startE2E, type E2E } from './support/harness';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(() => e2e?.stop());

describe('from the public page to the portal', () => {
  it('a visitor sends an enquiry, the owner accepts it, the new client follows the invitation and sees the commission', async () => {
    const visitor = await newPage(e2e, { phone: true });
    const v = visitor.page;
    await v.goto('/s/marrowgate');
    await v.getByLabel('Your name').fill('Rook Ambervale');
    await v.getByLabel('E-mail', { exact: true }).fill('rook.ambervale@demo.test');
    await v.getByLabel('Figure 1: name').fill('Ember drake');
    await v.getByLabel('How many of figure 1').fill('1');
    await v.getByLabel('Base size of figure 1').selectOption({ index: 1 });
    await v.getByRole('checkbox', { name: /may contact me/ }).check();
    await shot(v, 'public-page-phone');
    await v.getByRole('button', { name: 'Send the enquiry' }).click();
    await v.getByRole('heading', { name: 'Enquiry sent' }).waitFor();
    await visitor.context.close();

    const owner = await newPage(e2e);
    const o = owner.page;
    await signIn(o, 'owner@demo.test');
    await o.getByRole('navigation', { name: 'Studio' }).getByRole('link', { name: 'Enquiries' }).click();
    await o.getByRole('link', { name: /Rook Ambervale/ }).first().click();
    await o.getByRole('button', { name: 'Accept as commission' }).click();
    await o.getByRole('button', { name: 'Accept and create the commission' }).click();
    await o.getByText(/An invitation to the client portal went to/).waitFor();

    let link: string | null = null;
    for (let i = 0; i < 50 && !link; i++) {
      await o.goto('/dev/mail');
      const row = o.locator('tr', { hasText: 'rook.ambervale@demo.test' }).getByRole('link', { name: /invites you/ });
      if (await row.count()) {
        await row.first().click();
        link = await o.getByRole('link', { name: /\/invite\// }).first().getAttribute('href');
      } else await o.waitForTimeout(200);
    }
    if (!link) throw new Error('no invitation mail for the new client');
    await owner.context.close();

    const client = await newPage(e2e);
    const c = client.page;
    await c.goto(link);
    await c.getByLabel('Your name').fill('Rook Ambervale');
    await c.getByLabel('Choose a password').fill('a drake of my own');
    await c.getByRole('button', { name: /Accept and create my account/ }).click();
    await c.getByRole('heading', { name: 'My commissions' }).waitFor();
    await c.getByRole('link', { name: /Ember drake|Rook/ }).first().waitFor();
    await client.context.close();
  });
});
