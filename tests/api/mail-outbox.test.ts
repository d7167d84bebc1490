import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { SEND_CLAIM_MS } from '../../server/lib/mail/mailer';
import { Caller, signUp, startTestApp } from '../support/app';

/** A port with nothing listening: connections to it are refused. */
async function closedPort() {
  const srv = net.createServer();
  await new Promise<void>((r) => srv.listen(0, '127.0.0.1', () => r()));
  const port = (srv.address() as net.AddressInfo).port;
  await new Promise<void>((r) => srv.close(() => r()));
  return port;
}

describe('mail outbox', () => {
  it('keeps a message that SMTP refused, and delivers it exactly once after a restart', async () => {
    const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-outbox-'));
    // First run: mail goes to an SMTP address that refuses connections.
    const first = await startTestApp({ dataDir, smtpUrl: `smtp://127.0.0.1:${await closedPort()}` });
    await signUp(first, { email: 'resetme@example.test' });
    await new Caller(first.app).post('/api/auth/password-reset', { email: 'resetme@example.test' });
    await first.jobs.deliverMail();
    const pending = await first.db('outbox').where({ to: 'resetme@example.test' });
    expect(pending).toHaveLength(1);
    expect(pending[0]).toMatchObject({ status: 'pending', attempts: 1 });
    expect(pending[0].last_error).toBeTruthy();
    await first.close();

    // Second run on the same data, with the local capture inbox: the retry is due after the back-off.
    const second = await startTestApp({ dataDir });
    second.clock.set(first.clock.now());
    await second.jobs.deliverMail();
    expect(await second.db('captured_mail').where({ to: 'resetme@example.test' })).toHaveLength(0);
    second.clock.advance(61_000);
    await second.jobs.deliverMail();
    await second.jobs.deliverMail();
    second.clock.advance(3600_000);
    await second.jobs.deliverMail();
    const got = await second.db('captured_mail').where({ to: 'resetme@example.test' });
    expect(got).toHaveLength(1);
    expect(got[0].subject).toMatch(/password/i);
    expect(got[0].html).toContain('/reset-password/');
    expect(got[0].text).toContain('/reset-password/');
    expect((await second.db('outbox').where({ to: 'resetme@example.test' }).first()).status).toBe('sent');
    await second.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  });

  it('two processes delivering at once send each message once, and a claim left by a dead sender is taken up later', async () => {
    // Two instances on one database, as WORKERS > 1 or several machines run: each runs its own delivery pass.
    const a = await startTestApp();
    const b = await startTestApp({ dataDir: a.dataDir });
    b.clock.set(a.clock.now());
    const to = Array.from({ length: 12 }, (_, i) => `both-${i}@example.test`);
    for (const address of to) await a.mailer.enqueue({ to: address, template: 'test', subject: `for ${address}`, text: 'hello', html: '<p>hello</p>' });
    const [sentByA, sentByB] = await Promise.all([a.jobs.deliverMail(), b.jobs.deliverMail()]);
    expect(sentByA + sentByB).toBe(to.length);
    const caught = await a.db('captured_mail').whereIn('to', to);
    expect(caught.map((m) => m.to).sort()).toEqual([...to].sort());
    expect(await a.db('outbox').whereIn('to', to).whereNot({ status: 'sent' })).toEqual([]);

    // A sender that claimed a message and died: nobody sends it while the claim lasts, then it goes out once.
    await a.mailer.enqueue({ to: 'orphan@example.test', template: 'test', subject: 'orphan', text: 'hello', html: '<p>hello</p>' });
    await a.db('outbox').where({ to: 'orphan@example.test' }).update({ status: 'sending', next_attempt_at: new Date(a.clock.now().getTime() + SEND_CLAIM_MS).toISOString() });
    expect(await b.jobs.deliverMail()).toBe(0);
    b.clock.advance(SEND_CLAIM_MS + 1000);
    expect(await b.jobs.deliverMail()).toBe(1);
    expect(await a.db('captured_mail').where({ to: 'orphan@example.test' })).toHaveLength(1);
    await b.close();
    await a.stop();
  });

  it('/dev/mail lists captured messages with working links', async () => {
    const sw = await startTestApp();
    await signUp(sw, { email: 'inbox@example.test' });
    await new Caller(sw.app).post('/api/auth/password-reset', { email: 'inbox@example.test' });
    await sw.jobs.deliverMail();
    const list = await new Caller(sw.app).get('/dev/mail').expect(200);
    const id = list.text.match(/href="\/dev\/mail\/(\d+)"/)![1];
    const msg = await new Caller(sw.app).get(`/dev/mail/${id}`).expect(200);
    expect(msg.text).toMatch(/<a href="http:\/\/sablework\.test\/reset-password\/[A-Za-z0-9_-]+">/);
    const htmlPart = await new Caller(sw.app).get(`/dev/mail/${id}/html`).expect(200);
    expect(htmlPart.headers['content-security-policy']).toContain('sandbox');
    await sw.stop();
  });
});
