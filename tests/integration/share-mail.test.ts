import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { attachAlarms, DEFAULT_ALARM_DELIVERY } from '../../server/compose/alarms-root.js';
import { FakeSmtpServer, type ReceivedMail } from '../../server/alarms/fake-smtp.js';
import { SHARE_MAILS_PER_HOUR } from '../../server/http/routes/share-links-routes.js';
import { createTestContext, signInAs, TEST_USERS, type SignedInAgent, type TestContext } from './helpers/index.js';
import { eventually } from './runs-kit.js';

const CLIENT = 'buyer@client-firm.test';
const smtp = new FakeSmtpServer();
let t: TestContext;
let admin: SignedInAgent;
let tech: SignedInAgent;
let viewer: SignedInAgent;
let link: { id: number; token: string };

const toClient = () => smtp.received.filter((m) => m.to.includes(CLIENT));
const linkIn = (m: ReceivedMail) => /(http:\/\/\S+\/s\/([A-Za-z0-9_-]{43}))/.exec(m.text);

beforeAll(async () => {
  await smtp.start();
  t = await createTestContext({
    config: { alarms: { ...DEFAULT_ALARM_DELIVERY, smtpUrl: smtp.url, mailFrom: 'reports@northgate-cell-lab.test', retryFirstMs: 200, retryMaxMs: 400 } },
    attachments: [attachAlarms],
  });
  [admin, tech, viewer] = await Promise.all([signInAs(t, 'admin'), signInAs(t, 'technician'), signInAs(t, 'viewer')]);
  const pack = (await admin.post('/api/batteries').send({ label: 'Cell Stack 9', brand: 'Voltara', chemistry: 'lfp', cellsInSeries: 4, ratedAh: 50 }).expect(201)).body.battery;
  const made = (await tech.post('/api/share-links').send({ kind: 'battery', targetId: pack.id }).expect(201)).body;
  link = { id: made.link.id, token: made.token };
});
afterAll(async () => {
  await t?.close();
  await smtp.stop();
});

describe('e-mailing a share link to a client', () => {
  it('refuses a viewer, a bad address (with the field named) and a token that is not the link\'s', async () => {
    await viewer.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT }).expect(403);
    for (const to of [`${CLIENT}\r\nBcc: other@client-firm.test`, 'not an address', `Buyer <${CLIENT}>`, `${CLIENT}, other@client-firm.test`, '']) {
      const res = await tech.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to }).expect(400);
      expect(res.body.error.fields.to).toBeDefined();
    }
    await tech.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT, message: 'bell\u0007' }).expect(400);
    await tech.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT, bcc: 'x@client-firm.test' }).expect(400);
    const other = 'A'.repeat(43);
    const wrong = await tech.post(`/api/share-links/${link.id}/email`).send({ token: other, to: CLIENT }).expect(400);
    expect(wrong.body.error.message).toMatch(/cannot be e-mailed/);
    await tech.post('/api/share-links/999999/email').send({ token: link.token, to: CLIENT }).expect(404);
    expect(smtp.received).toHaveLength(0);
  });

  it('queues the mail; it reaches SMTP with a link that opens the shared report with no session, and the opening is logged', async () => {
    const answer = await tech.post(`/api/share-links/${link.id}/email`)
      .send({ token: link.token, to: CLIENT, message: 'Hello,\nthe capacity report is ready.\nBcc: nobody@client-firm.test' }).expect(202);
    expect(answer.body).toMatchObject({ queued: true });
    const [mail] = await eventually(async () => {
      expect(toClient()).toHaveLength(1);
      return toClient();
    });
    expect(mail!.to).toEqual([CLIENT]);
    expect(mail!.subject).toBe(`[My lab] ${TEST_USERS.technician.name} shared a report with you: pack Voltara Cell Stack 9`);
    // The note stays in the body: no header came from it, and the only recipient is the client.
    const headers = mail!.raw.split(/\r\n\r\n/)[0]!;
    expect(headers).not.toMatch(/^Bcc:/im);
    expect(headers).toMatch(new RegExp(`^Reply-To: ${TEST_USERS.technician.email}`, 'im'));
    expect(mail!.text).toContain('> Bcc: nobody@client-firm.test');
    const found = linkIn(mail!)!;
    expect(found[2]).toBe(link.token);
    expect(found[1]).toBe(`${t.url}/s/${link.token}`);
    expect(mail!.html).toContain(`href="${t.url}/s/${link.token}"`);

    // A fresh client with no cookie opens what the link's page loads.
    const anonymous = supertest(t.url);
    const report = (await anonymous.get(`/api/shared/${found[2]}`).expect(200)).body.report;
    expect(report).toMatchObject({ kind: 'battery', battery: { label: 'Cell Stack 9' } });
    expect((await tech.get(`/api/share-links/${link.id}/openings`).expect(200)).body.openings).toHaveLength(1);

    // The database never held the token in clear, and forgot even the sealed copy once sent.
    const [rows] = await t.ctx.sequelize.query('SELECT textBody, htmlBody, sealedSecret, status FROM mail_queue');
    expect(rows).toEqual([expect.objectContaining({ status: 'sent', sealedSecret: null })]);
    expect(JSON.stringify(rows)).not.toContain(link.token);
    const mails = (await tech.get(`/api/share-links/${link.id}/mails`).expect(200)).body.mails;
    expect(mails).toEqual([expect.objectContaining({ toAddress: CLIENT, status: 'sent', attempts: 1 })]);
  });

  it('SMTP down, then up: the mail goes out once through the durable queue', async () => {
    await smtp.stop();
    await tech.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT }).expect(202);
    await eventually(async () => {
      const mails = (await tech.get(`/api/share-links/${link.id}/mails`).expect(200)).body.mails;
      expect(mails[0]).toMatchObject({ status: 'pending' });
      expect(mails[0].attempts).toBeGreaterThanOrEqual(2);
      expect(mails[0].lastError).toBeTruthy();
    });
    await smtp.start();
    await eventually(async () => expect(toClient()).toHaveLength(2));
    await new Promise((r) => setTimeout(r, 1500));
    expect(toClient()).toHaveLength(2);
  });

  it(`allows ${SHARE_MAILS_PER_HOUR} share mails an hour per person, then answers 429`, async () => {
    // Two went out above.
    for (let i = 2; i < SHARE_MAILS_PER_HOUR; i++) await tech.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT }).expect(202);
    const limited = await tech.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT }).expect(429);
    expect(limited.body.error.message).toMatch(/an hour/);
    // Another person's allowance is their own, and a burst of parallel requests cannot slip past it.
    const burst = await Promise.all(Array.from({ length: SHARE_MAILS_PER_HOUR + 5 }, () => admin.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT })));
    expect(burst.filter((r) => r.status === 202)).toHaveLength(SHARE_MAILS_PER_HOUR);
    expect(burst.filter((r) => r.status === 429)).toHaveLength(5);
  });

  it('a revoked link can no longer be e-mailed', async () => {
    await tech.post(`/api/share-links/${link.id}/revoke`).send({}).expect(200);
    await admin.post(`/api/share-links/${link.id}/email`).send({ token: link.token, to: CLIENT }).expect(400);
  });
});
