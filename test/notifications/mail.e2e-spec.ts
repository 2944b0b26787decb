/**
 * Notification mail on the embedded database (the queue's in-process mode, same SQL), sent by nodemailer to an SMTP
 * server in this process on loopback (smtp-server), read back with mailparser: reviewers on submission, the author
 * on decision and comment, each with a link to the page under LEADLINE_PUBLIC_URL; preferences respected; no design
 * content in any mail.
 */
import { simpleParser, type ParsedMail } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { QueueService } from '../../apps/api/src/queue/queue.service';
import { warningDesign } from '../support/designs';
import { startTestApp, type TestApp } from '../support/harness';

let t: TestApp;
let smtp: SMTPServer;
const mails: ParsedMail[] = [];
const PUBLIC_URL = 'https://leadline.example.test';

beforeAll(async () => {
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    onData(stream, _session, callback) {
      simpleParser(stream).then((m) => {
        mails.push(m);
        callback();
      }, callback);
    },
  });
  await new Promise<void>((resolve) => smtp.listen(0, '127.0.0.1', resolve));
  const { port } = smtp.server.address() as { port: number };
  t = await startTestApp('pglite', { LEADLINE_SMTP_URL: `smtp://127.0.0.1:${port}`, LEADLINE_MAIL_FROM: 'Leadline <leadline@example.test>', LEADLINE_PUBLIC_URL: PUBLIC_URL });
  for (const [who, email, enabled] of [['author', 'author@example.test', true], ['reviewer', 'checker@example.test', true], ['reviewer2', 'second@example.test', false]] as const) {
    const res = await t.call('PUT', '/api/v1/me/notifications', { email, enabled }, { as: who });
    expect(res.body).toEqual({ email, enabled, sendsTo: enabled ? email : null });
  }
});
afterAll(async () => {
  await t?.close();
  await new Promise<void>((resolve) => smtp.close(() => resolve()));
});

const to = (m: ParsedMail) => (Array.isArray(m.to) ? m.to : [m.to]).flatMap((a) => a!.value.map((v) => v.address));

it('mails reviewers who want it on submission, and the author on comment and decision, each with its link', async () => {
  const productId = (await t.call('POST', '/api/v1/products', { code: 'ML-7', name: 'Marlow ML-7 scissor lift (test product)' })).body.id;
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Scissor lift screw', design: warningDesign });
  expect(opened.status).toBe(201);
  await t.app.get(QueueService).drain();
  expect(mails.map(to)).toEqual([['checker@example.test']]);
  const submitted = mails[0];
  expect(submitted.from!.value[0].address).toBe('leadline@example.test');
  expect(submitted.subject).toBe('Scissor lift screw (ML-7), revision 1: awaiting review');
  expect(submitted.text).toContain(`${PUBLIC_URL}/review/revisions/${opened.body.revisionId}`);
  expect(submitted.text).toContain('Product: ML-7 Marlow ML-7 scissor lift (test product)');

  mails.length = 0;
  expect((await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: 'Which lubricant is the friction range for?' }, { as: 'reviewer' })).status).toBe(201);
  const rejected = await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/decisions`, { decision: 'reject', comment: 'Measure the friction first.' }, { as: 'reviewer' });
  expect(rejected.status).toBe(201);
  await t.app.get(QueueService).drain();
  expect(mails.map(to)).toEqual([['author@example.test'], ['author@example.test']]);
  expect(mails.map((m) => m.subject).sort()).toEqual(['Scissor lift screw (ML-7), revision 1: commented on', 'Scissor lift screw (ML-7), revision 1: rejected']);
  for (const m of mails) {
    expect(m.text).toContain(`${PUBLIC_URL}/design/calculations/${opened.body.calculationId}`);
    // No design content: neither the comment's words nor any input of the design
    expect(m.text).not.toMatch(/lubricant|Measure the friction|friction|\bkN\b|\bmm\b|\brpm\b/);
  }
});

it('sends nothing to a user whose mail is off, and nothing for their own acts', async () => {
  const productId = (await t.call('POST', '/api/v1/products', { code: 'ML-8', name: 'Marlow ML-8 scissor lift (test product)' })).body.id;
  mails.length = 0;
  // reviewer2 (mail off) submits as an author: the reviewer with mail on is told, reviewer2 is not
  const opened = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Second lift screw', design: warningDesign }, { as: 'reviewer2' });
  expect(opened.status).toBe(201);
  // the author comments on nothing of theirs here; reviewer2 comments on their own revision: no mail to anyone
  expect((await t.call('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, { text: 'Note to self.' }, { as: 'reviewer2' })).status).toBe(201);
  await t.app.get(QueueService).drain();
  expect(mails.map(to)).toEqual([['checker@example.test']]);
  expect((await t.call('PUT', '/api/v1/me/notifications', { email: 'not an address', enabled: true }, { as: 'author' })).body.errors[0].path).toBe('email');
});

it('falls back to the account\'s own email when no notification address is set, and sends nothing once mail is off', async () => {
  // author2 never set a preference: mail is on, to the account's email
  expect((await t.call('GET', '/api/v1/me/notifications', undefined, { as: 'author2' })).body).toEqual({ email: null, enabled: true, sendsTo: t.emails.author2 });
  const productId = (await t.call('POST', '/api/v1/products', { code: 'ML-9', name: 'Marlow ML-9 scissor lift (test product)' }, { as: 'author2' })).body.id;
  const first = await t.call('POST', `/api/v1/products/${productId}/calculations`, { title: 'Third lift screw', design: warningDesign }, { as: 'author2' });
  await t.app.get(QueueService).drain();
  mails.length = 0;
  expect((await t.call('POST', `/api/v1/revisions/${first.body.revisionId}/comments`, { text: 'Seen.' }, { as: 'reviewer' })).status).toBe(201);
  await t.app.get(QueueService).drain();
  expect(mails.map(to)).toEqual([[t.emails.author2]]);
  expect(mails[0].subject).toBe('Third lift screw (ML-9), revision 1: commented on');

  // a preference with mail on and no address of its own also uses the account's email
  expect((await t.call('PUT', '/api/v1/me/notifications', { email: null, enabled: true }, { as: 'author2' })).body).toEqual({ email: null, enabled: true, sendsTo: t.emails.author2 });
  mails.length = 0;
  expect((await t.call('POST', `/api/v1/revisions/${first.body.revisionId}/comments`, { text: 'Seen again.' }, { as: 'reviewer' })).status).toBe(201);
  await t.app.get(QueueService).drain();
  expect(mails.map(to)).toEqual([[t.emails.author2]]);

  // mail off: nothing, whatever addresses exist
  expect((await t.call('PUT', '/api/v1/me/notifications', { email: null, enabled: false }, { as: 'author2' })).body).toEqual({ email: null, enabled: false, sendsTo: null });
  mails.length = 0;
  expect((await t.call('POST', `/api/v1/revisions/${first.body.revisionId}/comments`, { text: 'Third note.' }, { as: 'reviewer' })).status).toBe(201);
  await t.app.get(QueueService).drain();
  expect(mails).toEqual([]);
});
