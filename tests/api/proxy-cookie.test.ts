import request from 'supertest';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
beforeAll(async () => {
  sw = await startTestApp({ trustProxy: true, publicUrl: 'https://studio.example.test' });
});
afterAll(() => sw.stop());

const sessionCookie = (res: request.Response) => ((res.headers['set-cookie'] as unknown as string[]) ?? []).find((c) => /^(__Host-)?sablework\.sid=/.test(c));

it('marks the session cookie Secure behind an HTTPS proxy (TRUST_PROXY)', async () => {
  const viaHttps = await request(sw.app).get('/api/auth/csrf').set('X-Forwarded-Proto', 'https');
  expect(sessionCookie(viaHttps)).toMatch(/; Secure/);
  expect(viaHttps.headers['strict-transport-security']).toBeTruthy();
});
