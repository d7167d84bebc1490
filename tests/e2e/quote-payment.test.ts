import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { newPage, shot, signIn, startE2E, type E2E } from './support/harness';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(() => e2e?.stop());

/** Calls the API from the signed-in page's own session, with its CSRF token. */
async function api(page: Page, method: 'GET' | 'POST', url: string, data?: unknown) {
  const { token } = await (await page.request.get('/api/auth/csrf')).json();
  const res = await page.request.fetch(url, { method, headers: { 'x-csrf-token': token }, data: data as object });
  if (!res.ok()) throw new Error(`${method} ${url}: ${res.status()} ${await res.text()}`);
  return res.json();
}

describe('quote to deposit', () => {
  it('the client accepts a sent quote and pays the deposit on the payment checkout page; the invoice shows paid', async () => {
    // The owner prices and sends a quote for Priya's enquiry (through the API: this test is about the client).
    const owner = await newPage(e2e);
    await signIn(owner.page, 'owner@demo.test');
    await owner.page.waitForURL(/\/studio\/\d+/);
    const studioId = owner.page.url().match(/\/studio\/(\d+)/)![1];
    const list = await api(owner.page, 'GET', `/api/studios/${studioId}/commissions?q=Heron-knight`);
    const commissionId = list.items[0].id;
    const draft = await api(owner.page, 'POST', `/api/studios/${studioId}/commissions/${commissionId}/quotes`, {});
    const sent = await api(owner.page, 'POST', `/api/studios/${studioId}/quotes/${draft.id}/send`);
    expect(sent.status).toBe('sent');
    await owner.context.close();

    const client = await newPage(e2e);
    const c = client.page;
    await signIn(c, 'client@demo.test');
    await c.waitForURL(/\/studio\/\d+/);
    await c.goto(`/studio/${studioId}/quotes/${draft.id}`);
    const form = c.getByRole('form', { name: 'Accept the quote' });
    await form.getByLabel('Your full name').fill('Priya Castellane');
    await form.getByRole('checkbox').check();
    await shot(c, 'client-quote');
    await form.getByRole('button', { name: 'Accept quote' }).click();
    await c.getByText(/accepted/i).first().waitFor();

    // The deposit invoice is waiting; pay it on the checkout page of the local payment fake.
    await c.goto(`/studio/${studioId}/invoices`);
    await c.getByRole('link', { name: /\d{4}-\d{4}/ }).first().waitFor();
    const invoices = await api(c, 'GET', `/api/studios/${studioId}/invoices?commissionId=${commissionId}`);
    const deposit = invoices.items.find((i: { kind: string }) => i.kind === 'deposit');
    expect(deposit.status).toBe('open');
    await c.goto(`/studio/${studioId}/invoices/${deposit.id}`);
    await c.getByRole('button', { name: /^Pay / }).click();
    await c.waitForURL(/\/pay\//);
    await c.getByLabel('Card number').fill('4242 4242 4242 4242');
    await c.getByLabel('Expiry (MM/YY)').fill('12/34');
    await c.getByLabel('Security code').fill('123');
    await shot(c, 'fake-checkout');
    await c.getByRole('button', { name: /^Pay / }).click();
    await c.waitForURL(/\/invoices\/\d+\/paid/);
    await c.getByRole('heading', { name: 'Payment received — thank you' }).waitFor({ timeout: 30_000 });
    const after = await api(c, 'GET', `/api/studios/${studioId}/invoices/${deposit.id}`);
    expect(after.status).toBe('paid');
    await client.context.close();
  });
});
