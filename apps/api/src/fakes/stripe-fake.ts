import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomBytes } from 'node:crypto';
import Stripe from 'stripe';
import type { Fake } from './fake.js';

export interface StripeFakeOptions {
  host?: string;
  /** 0 picks a free port; read the real one from `port()` after `start()`. */
  port: number;
  /** The key the API must present, e.g. sk_test_local_fake. */
  secretKey: string;
  /** Signs the webhook events, exactly as the real service does with an endpoint's secret. */
  webhookSecret: string;
  /** Where paid sessions are announced; may be set later with `setWebhookUrl` (tests learn the API's port late). */
  webhookUrl?: string;
}

export interface FakeCheckoutSession {
  id: string;
  object: 'checkout.session';
  mode: string;
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_total: number;
  currency: string;
  customer_email: string | null;
  client_reference_id: string | null;
  metadata: Record<string, string>;
  payment_intent: string | null;
  success_url: string;
  cancel_url: string | null;
  url: string;
  created: number;
  description: string;
}

export interface StripeFake extends Fake {
  port(): number;
  sessions(): readonly FakeCheckoutSession[];
  setWebhookUrl(url: string): void;
  /** What the pay button does: completes the session and posts the signed event; returns the webhook's HTTP status. */
  pay(sessionId: string): Promise<number>;
}

type FormValue = string | FormObject;
interface FormObject {
  [key: string]: FormValue;
}

/** Reads the bracketed form encoding the Stripe SDK sends (line_items[0][price_data][unit_amount]=…). */
export function parseStripeForm(body: string): FormObject {
  const root: FormObject = {};
  for (const [key, value] of new URLSearchParams(body)) {
    const parts = key.split(/\[|\]/).filter((p) => p !== '');
    let node = root;
    parts.forEach((part, index) => {
      if (index === parts.length - 1) {
        node[part] = value;
        return;
      }
      const next = node[part];
      if (typeof next === 'object') node = next;
      else {
        const created: FormObject = {};
        node[part] = created;
        node = created;
      }
    });
  }
  return root;
}

const id = (prefix: string) => `${prefix}_test_${randomBytes(12).toString('hex')}`;
const str = (v: FormValue | undefined): string | undefined => (typeof v === 'string' ? v : undefined);
const obj = (v: FormValue | undefined): FormObject => (typeof v === 'object' ? v : {});

export function createStripeFake(options: StripeFakeOptions): StripeFake {
  const host = options.host ?? '127.0.0.1';
  let port = options.port;
  let webhookUrl = options.webhookUrl ?? '';
  const sessions = new Map<string, FakeCheckoutSession>();
  const signer = new Stripe(options.secretKey, { telemetry: false, maxNetworkRetries: 0 });

  const http: Server = createServer((req, res) => {
    route(req, res).catch((err: unknown) => sendJson(res, 500, { error: { type: 'api_error', message: String(err) } }));
  });

  async function route(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const url = new URL(req.url ?? '/', `http://${host}`);
    const method = req.method ?? 'GET';
    if (url.pathname === '/health') return sendJson(res, 200, { status: 'ok' });

    if (url.pathname.startsWith('/v1/')) {
      if (req.headers.authorization !== `Bearer ${options.secretKey}`) {
        return sendJson(res, 401, { error: { type: 'invalid_request_error', message: 'Invalid API Key provided.' } });
      }
      if (url.pathname === '/v1/checkout/sessions' && method === 'POST') {
        return createSession(parseStripeForm(await readBody(req)), res);
      }
      const one = /^\/v1\/checkout\/sessions\/([\w]+)$/.exec(url.pathname);
      if (one && method === 'GET') {
        const session = sessions.get(one[1]!);
        return session ? sendJson(res, 200, session) : notFound(res, one[1]!);
      }
      return sendJson(res, 404, { error: { type: 'invalid_request_error', message: `Unrecognized request URL (${method}: ${url.pathname}).` } });
    }

    const page = /^\/pay\/([\w]+)(\/cancel)?$/.exec(url.pathname);
    if (page) {
      const session = sessions.get(page[1]!);
      if (!session) return sendHtml(res, 404, layout('Payment not found', '<p>This payment page does not exist or has been replaced.</p>'));
      if (page[2] && method === 'POST') return redirect(res, session.cancel_url ?? session.success_url);
      if (method === 'GET') return sendHtml(res, 200, renderPayPage(session));
      if (method === 'POST') {
        if (session.status === 'complete') return redirect(res, session.success_url);
        const status = await pay(session.id);
        if (status >= 200 && status < 300) return redirect(res, session.success_url);
        return sendHtml(res, 502, layout('Payment not confirmed', `<p>The shop's server answered ${status} to the payment notice.</p>`));
      }
    }
    sendHtml(res, 404, layout('Not found', '<p>Not found.</p>'));
  }

  function createSession(form: FormObject, res: ServerResponse): void {
    const successUrl = str(form.success_url);
    const item = obj(obj(form.line_items)['0']);
    const price = obj(item.price_data);
    const unitAmount = Number(str(price.unit_amount));
    const quantity = Number(str(item.quantity) ?? '1');
    if (!successUrl || !Number.isInteger(unitAmount) || unitAmount < 1 || !Number.isInteger(quantity)) {
      sendJson(res, 400, { error: { type: 'invalid_request_error', message: 'success_url and one line item with a unit_amount are required.' } });
      return;
    }
    const sessionId = id('cs');
    const metadata: Record<string, string> = {};
    for (const [k, v] of Object.entries(obj(form.metadata))) if (typeof v === 'string') metadata[k] = v;
    const session: FakeCheckoutSession = {
      id: sessionId,
      object: 'checkout.session',
      mode: str(form.mode) ?? 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_total: unitAmount * quantity,
      currency: str(form.currency) ?? str(price.currency) ?? 'gbp',
      customer_email: str(form.customer_email) ?? null,
      client_reference_id: str(form.client_reference_id) ?? null,
      metadata,
      payment_intent: null,
      success_url: successUrl,
      cancel_url: str(form.cancel_url) ?? null,
      url: `http://${host}:${port}/pay/${sessionId}`,
      created: Math.floor(Date.now() / 1000),
      description: str(obj(price.product_data).name) ?? 'Payment',
    };
    sessions.set(sessionId, session);
    sendJson(res, 200, session);
  }

  async function pay(sessionId: string): Promise<number> {
    const session = sessions.get(sessionId);
    if (!session) throw new Error(`no session ${sessionId}`);
    if (!webhookUrl) throw new Error('the Stripe fake has no webhook URL to notify');
    Object.assign(session, { status: 'complete', payment_status: 'paid', payment_intent: id('pi') });
    const payload = JSON.stringify({
      id: id('evt'),
      object: 'event',
      api_version: '2025-01-01',
      created: Math.floor(Date.now() / 1000),
      type: 'checkout.session.completed',
      livemode: false,
      pending_webhooks: 1,
      data: { object: session },
    });
    const signature = signer.webhooks.generateTestHeaderString({ payload, secret: options.webhookSecret });
    const answer = await fetch(webhookUrl, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'stripe-signature': signature },
      body: payload,
      signal: AbortSignal.timeout(10_000),
    });
    await answer.arrayBuffer();
    return answer.status;
  }

  return {
    name: 'stripe',
    async start() {
      await new Promise<void>((resolve, reject) => {
        http.once('error', reject);
        http.listen(port, host, () => {
          http.off('error', reject);
          resolve();
        });
      });
      port = (http.address() as AddressInfo).port;
      return [`API on http://${host}:${port}/v1`, `webhooks to ${webhookUrl || '(not set)'}`];
    },
    async stop() {
      await new Promise<void>((resolve) => {
        http.close(() => resolve());
        http.closeAllConnections();
      });
    },
    port: () => port,
    sessions: () => [...sessions.values()],
    setWebhookUrl(url) {
      webhookUrl = url;
    },
    pay,
  };
}

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req) {
    size += (chunk as Buffer).length;
    if (size > 1024 * 1024) throw new Error('request body too large');
    chunks.push(chunk as Buffer);
  }
  return Buffer.concat(chunks).toString('utf8');
}

function notFound(res: ServerResponse, sessionId: string): void {
  sendJson(res, 404, { error: { type: 'invalid_request_error', message: `No such checkout.session: '${sessionId}'` } });
}

function sendJson(res: ServerResponse, status: number, body: unknown): void {
  res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store' }).end(JSON.stringify(body));
}

function sendHtml(res: ServerResponse, status: number, body: string): void {
  res.writeHead(status, { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' }).end(body);
}

function redirect(res: ServerResponse, location: string): void {
  res.writeHead(303, { location }).end();
}

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function money(pence: number, currency: string): string {
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() }).format(pence / 100);
}

function layout(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)}</title>
<style>
  body { font: 16px/1.5 system-ui, sans-serif; margin: 0; background: #eef1f4; color: #1d2327; }
  main { max-width: 26rem; margin: 3rem auto; background: #fff; border-radius: 10px; padding: 1.5rem; box-shadow: 0 1px 3px #0002; }
  h1 { font-size: 1.2rem; margin: 0 0 .25rem; }
  .note { font-size: .85rem; color: #5c6770; background: #fff7e0; border: 1px solid #f0d98a; border-radius: 6px; padding: .5rem .75rem; }
  .amount { font-size: 2rem; font-weight: 700; margin: 1rem 0; }
  button { font: inherit; padding: .7rem 1rem; border-radius: 6px; border: 0; background: #2a5bd7; color: #fff; width: 100%; cursor: pointer; }
  button.secondary { background: transparent; color: #2a5bd7; }
</style></head><body><main>${body}</main></body></html>`;
}

function renderPayPage(session: FakeCheckoutSession): string {
  if (session.status === 'complete') {
    return layout('Paid', `<h1>Already paid</h1><p>${escapeHtml(session.description)}: ${money(session.amount_total, session.currency)}.</p>`);
  }
  return layout(
    'Local test payment',
    `<p class="note">Local test payment service. No card is charged and no money moves.</p>
<h1>${escapeHtml(session.description)}</h1>
<p class="amount">${money(session.amount_total, session.currency)}</p>
${session.customer_email ? `<p>Receipt to ${escapeHtml(session.customer_email)}</p>` : ''}
<form method="post" action="/pay/${session.id}"><button type="submit">Pay ${money(session.amount_total, session.currency)}</button></form>
<form method="post" action="/pay/${session.id}/cancel"><button type="submit" class="secondary">Cancel and go back</button></form>`,
  );
}
