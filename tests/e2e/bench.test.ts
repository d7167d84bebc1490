import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newPage, shot, signIn, startE2E, type E2E } from './support/harness';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(() => e2e?.stop());

/** A small generated picture (never a real photograph): two coloured bands. */
const picture = () =>
  sharp({ create: { width: 640, height: 480, channels: 3, background: '#4f6b45' } })
    .composite([{ input: { create: { width: 640, height: 160, channels: 3, background: '#cfc4a6' } }, top: 320, left: 0 }])
    .jpeg()
    .toBuffer();

describe('commissions on the bench', () => {
  it('a painter moves a card on by keyboard alone, uploads a shared photo and marks a stage done; the client sees the photo and approves the scheme', async () => {
    const painter = await newPage(e2e);
    const p = painter.page;
    await signIn(p, 'painter@demo.test');
    await p.getByRole('navigation', { name: 'Studio' }).getByRole('link', { name: 'Bench' }).click();
    await p.getByRole('region', { name: 'Bench board' }).waitFor();

    // Keyboard only: focus the card's handle, Space to lift, right arrow to the next stage, Space to drop.
    const handle = p.getByRole('button', { name: 'Drag Tidecaller banner bearer to Assembly' });
    await handle.focus();
    for (const key of ['Space', 'ArrowRight', 'Space']) {
      await p.keyboard.press(key);
      await p.waitForTimeout(300);
    }
    await p.getByRole('button', { name: 'Drag Tidecaller banner bearer to Prime' }).waitFor();

    // A progress photo of the shaman, shared with the client.
    await p.getByRole('button', { name: 'Add a photo of Mire shaman' }).click();
    const dialog = p.getByRole('dialog');
    await dialog.getByRole('switch', { name: 'Shared with client' }).click();
    await dialog.locator('input[type=file]').setInputFiles({ name: 'shaman-glaze.jpg', mimeType: 'image/jpeg', buffer: await picture() });
    await dialog.getByText(/Uploaded|Done|Sent/i).first().waitFor({ timeout: 30_000 });
    await p.keyboard.press('Escape');

    await p.getByRole('button', { name: /Mark Glaze done for Mire shaman/ }).click();
    await p.getByRole('button', { name: /Mark Details done for Mire shaman/ }).waitFor();
    await shot(p, 'bench-after-moves');

    // Ask the client to approve the colour scheme, from the commission page.
    await p.getByRole('link', { name: 'Bog-lantern goblin warband' }).first().click();
    const ask = p.getByRole('form', { name: 'Ask the client to approve' });
    await ask.getByLabel('What should the client approve?').selectOption('scheme');
    await ask.getByRole('button', { name: 'Ask for approval' }).click();
    await p.getByText('The client has been asked.', { exact: false }).first().waitFor();
    await painter.context.close();

    const client = await newPage(e2e);
    const c = client.page;
    await signIn(c, 'client@demo.test');
    await c.getByRole('link', { name: /Bog-lantern goblin warband/ }).first().click();
    await c.getByRole('button', { name: /Open .* larger/ }).first().waitFor();
    const photos = await c.getByRole('button', { name: /Open .* larger/ }).count();
    expect(photos).toBeGreaterThan(0);
    await c.getByRole('button', { name: 'Approve colour scheme' }).first().click();
    await c.getByText('Approved. The studio has been told.').waitFor();
    await shot(c, 'client-commission');
    await client.context.close();
  });
});
