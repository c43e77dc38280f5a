import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import nodemailer, { type Transporter } from 'nodemailer';
import { createMailCatcher, type CaughtMail, type MailCatcher } from './mail-catcher.js';

describe('mail catcher', () => {
  let catcher: MailCatcher;
  let base: string;
  let transport: Transporter;

  beforeAll(async () => {
    catcher = createMailCatcher({ smtpPort: 0, httpPort: 0 });
    await catcher.start();
    const { smtp, http } = catcher.ports();
    base = `http://127.0.0.1:${http}`;
    transport = nodemailer.createTransport({ host: '127.0.0.1', port: smtp, secure: false, ignoreTLS: true });
  });

  afterAll(async () => {
    transport.close();
    await catcher.stop();
  });

  beforeEach(async () => {
    await fetch(`${base}/messages`, { method: 'DELETE' });
  });

  async function list(query = ''): Promise<CaughtMail[]> {
    const res = await fetch(`${base}/messages${query}`);
    expect(res.status).toBe(200);
    return (await res.json()) as CaughtMail[];
  }

  it('keeps a sent message and serves its parts as JSON', async () => {
    await transport.sendMail({
      from: 'Office <office@brickfield.test>',
      to: 'new.starter@brickfield.test',
      subject: 'Join Brickfield Builders',
      text: 'Set your password: http://localhost:3000/invite/abc123',
      html: '<p>Set your password: <a href="http://localhost:3000/invite/abc123">accept</a></p>',
    });

    const [mail, ...rest] = await list();
    expect(rest).toHaveLength(0);
    expect(mail).toMatchObject({
      from: 'Office <office@brickfield.test>',
      to: ['new.starter@brickfield.test'],
      subject: 'Join Brickfield Builders',
    });
    expect(mail?.text).toContain('http://localhost:3000/invite/abc123');
    expect(mail?.html).toContain('href="http://localhost:3000/invite/abc123"');
    expect(Number.isNaN(Date.parse(mail?.date ?? ''))).toBe(false);

    const one = await fetch(`${base}/messages/${mail?.id}`);
    expect(await one.json()).toEqual(mail);
  });

  it('lists the newest message first and filters by recipient, Bcc included', async () => {
    await transport.sendMail({ from: 'a@x.test', to: 'first@x.test', subject: 'one', text: '1' });
    await transport.sendMail({ from: 'a@x.test', to: 'second@x.test', bcc: 'Hidden@X.test', subject: 'two', text: '2' });

    expect((await list()).map((m) => m.subject)).toEqual(['two', 'one']);
    expect((await list('?to=first@x.test')).map((m) => m.subject)).toEqual(['one']);
    expect((await list('?to=hidden@x.test')).map((m) => m.subject)).toEqual(['two']);
  });

  it('forgets every message on DELETE /messages', async () => {
    await transport.sendMail({ from: 'a@x.test', to: 'b@x.test', subject: 'gone soon', text: 'x' });
    expect(await list()).toHaveLength(1);

    const res = await fetch(`${base}/messages`, { method: 'DELETE' });
    expect(res.status).toBe(204);
    expect(await list()).toEqual([]);
  });

  it('shows caught mail on the page with links made clickable and markup escaped', async () => {
    await transport.sendMail({
      from: 'a@x.test',
      to: 'b@x.test',
      subject: 'Reset <yours>',
      text: 'Reset here: http://localhost:3000/reset/t0k3n',
    });
    const [mail] = await list();

    const page = await (await fetch(`${base}/`)).text();
    expect(page).toContain(`href="/view/${mail?.id}"`);
    expect(page).toContain('Reset &#60;yours&#62;');
    expect(page).not.toContain('<yours>');

    const view = await (await fetch(`${base}/view/${mail?.id}`)).text();
    expect(view).toContain('<a href="http://localhost:3000/reset/t0k3n"');
  });

  it('answers 404 for an unknown message id', async () => {
    const res = await fetch(`${base}/messages/does-not-exist`);
    expect(res.status).toBe(404);
  });
});
