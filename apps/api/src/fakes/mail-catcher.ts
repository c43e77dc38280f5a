import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomUUID } from 'node:crypto';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { Fake } from './fake.js';

export interface CaughtMail {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  date: string;
}

export interface MailCatcherOptions {
  host?: string;
  /** 0 picks a free port; read the real one from `ports()` after `start()`. */
  smtpPort: number;
  httpPort: number;
  /** Oldest messages are dropped past this count so a long dev session cannot grow without bound. */
  limit?: number;
}

export interface MailCatcher extends Fake {
  ports(): { smtp: number; http: number };
  messages(): readonly CaughtMail[];
  clear(): void;
}

const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

export function createMailCatcher(options: MailCatcherOptions): MailCatcher {
  const host = options.host ?? '127.0.0.1';
  const limit = options.limit ?? 500;
  // Newest first, the order both the page and the JSON endpoint show.
  let inbox: CaughtMail[] = [];
  let smtpPort = options.smtpPort;
  let httpPort = options.httpPort;

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream: SMTPServerDataStream, session: SMTPServerSession, callback: (err?: Error | null) => void) {
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('error', callback);
      stream.on('end', () => {
        if (stream.sizeExceeded) {
          callback(Object.assign(new Error('Message exceeds the fixed maximum message size'), { responseCode: 552 }));
          return;
        }
        simpleParser(Buffer.concat(chunks))
          .then((parsed) => {
            const envelopeTo = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
            const headerTo = addressesOf(parsed.to);
            inbox.unshift({
              id: randomUUID(),
              from: formatFrom(parsed.from) ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
              // The envelope also covers Bcc recipients, which tests look mail up by.
              to: [...new Set([...headerTo, ...envelopeTo])],
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              html: typeof parsed.html === 'string' ? parsed.html : null,
              date: new Date().toISOString(),
            });
            inbox = inbox.slice(0, limit);
            callback();
          })
          .catch((err: unknown) => callback(err instanceof Error ? err : new Error(String(err))));
      });
    },
  });

  const http: Server = createServer((req, res) => {
    try {
      route(req, res);
    } catch (err) {
      send(res, 500, 'text/plain; charset=utf-8', String(err));
    }
  });

  function route(req: IncomingMessage, res: ServerResponse): void {
    const url = new URL(req.url ?? '/', `http://${host}`);
    const path = url.pathname.replace(/\/+$/, '') || '/';
    const method = req.method ?? 'GET';

    if (path === '/messages' && method === 'GET') {
      const to = url.searchParams.get('to')?.toLowerCase();
      return sendJson(res, 200, to ? inbox.filter((m) => m.to.includes(to)) : inbox);
    }
    if (path === '/messages' && method === 'DELETE') {
      inbox = [];
      res.writeHead(204).end();
      return;
    }
    const one = /^\/messages\/([\w-]+)$/.exec(path);
    if (one && method === 'GET') {
      const mail = inbox.find((m) => m.id === one[1]);
      return mail ? sendJson(res, 200, mail) : sendJson(res, 404, { error: 'no such message' });
    }
    if (path === '/health' && method === 'GET') return sendJson(res, 200, { status: 'ok' });
    if (path === '/' && method === 'GET') return send(res, 200, 'text/html; charset=utf-8', renderList(inbox));
    const view = /^\/view\/([\w-]+)$/.exec(path);
    if (view && method === 'GET') {
      const mail = inbox.find((m) => m.id === view[1]);
      if (mail) return send(res, 200, 'text/html; charset=utf-8', renderMail(mail));
    }
    if (path === '/clear' && method === 'POST') {
      inbox = [];
      res.writeHead(303, { location: '/' }).end();
      return;
    }
    send(res, 404, 'text/plain; charset=utf-8', 'Not found');
  }

  return {
    name: 'mail',
    async start() {
      await new Promise<void>((resolve, reject) => {
        smtp.once('error', reject);
        smtp.listen(smtpPort, host, () => {
          smtp.off('error', reject);
          resolve();
        });
      });
      // smtp-server keeps its net.Server on `server`; the typings leave it out.
      smtpPort = ((smtp as unknown as { server: Server }).server.address() as AddressInfo).port;
      await new Promise<void>((resolve, reject) => {
        http.once('error', reject);
        http.listen(httpPort, host, () => {
          http.off('error', reject);
          resolve();
        });
      });
      httpPort = (http.address() as AddressInfo).port;
      return [`SMTP on ${host}:${smtpPort}`, `page on http://${host}:${httpPort}/`];
    },
    async stop() {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      await new Promise<void>((resolve) => {
        http.close(() => resolve());
        http.closeAllConnections();
      });
    },
    ports: () => ({ smtp: smtpPort, http: httpPort }),
    messages: () => inbox,
    clear: () => {
      inbox = [];
    },
  };
}

function addressesOf(field: AddressObject | AddressObject[] | undefined): string[] {
  const groups = field === undefined ? [] : Array.isArray(field) ? field : [field];
  return groups.flatMap((g) => g.value.flatMap((a) => [a.address, ...(a.group ?? []).map((m) => m.address)]))
    .filter((a): a is string => Boolean(a))
    .map((a) => a.toLowerCase());
}

function formatFrom(field: AddressObject | undefined): string | undefined {
  const first = field?.value[0];
  if (!first?.address) return field?.text;
  return first.name ? `${first.name} <${first.address}>` : first.address;
}

function send(res: ServerResponse, status: number, type: string, body: string): void {
  res.writeHead(status, { 'content-type': type, 'cache-control': 'no-store' }).end(body);
}

function sendJson(res: ServerResponse, status: number, body: unknown): void {
  send(res, status, 'application/json; charset=utf-8', JSON.stringify(body));
}

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

const URL_PATTERN = /\bhttps?:\/\/[^\s<>"')\]]+/g;

function linkify(text: string): string {
  let out = '';
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const at = match.index ?? 0;
    out += escapeHtml(text.slice(last, at));
    const href = escapeHtml(match[0]);
    out += `<a href="${href}" target="_blank" rel="noopener">${href}</a>`;
    last = at + match[0].length;
  }
  return out + escapeHtml(text.slice(last));
}

const PAGE_STYLE = `
  body { font: 15px/1.45 system-ui, sans-serif; margin: 0; color: #1d2327; background: #f4f2ee; }
  header { background: #2f3b45; color: #fff; padding: .75rem 1.25rem; display: flex; gap: 1rem; align-items: center; }
  header h1 { font-size: 1.05rem; margin: 0; flex: 1; }
  header a, header button { color: #fff; }
  header button { background: transparent; border: 1px solid #fff8; border-radius: 4px; padding: .25rem .6rem; cursor: pointer; }
  main { padding: 1rem 1.25rem; max-width: 70rem; }
  table { border-collapse: collapse; width: 100%; background: #fff; }
  th, td { text-align: left; padding: .45rem .6rem; border-bottom: 1px solid #e2ded6; vertical-align: top; }
  th { font-weight: 600; background: #ebe7df; }
  pre { white-space: pre-wrap; word-break: break-word; background: #fff; padding: .75rem; border: 1px solid #e2ded6; }
  iframe { width: 100%; min-height: 24rem; border: 1px solid #e2ded6; background: #fff; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: .2rem 1rem; }
  dt { font-weight: 600; }
  .empty { color: #5c6770; }
  td { overflow-wrap: anywhere; }
  @media (max-width: 40rem) {
    thead { display: none; }
    table, tbody, tr, td { display: block; }
    tr { border-bottom: 1px solid #e2ded6; padding: .35rem 0; }
    td { border: 0; padding: .1rem .6rem; }
  }
`;

function layout(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title><style>${PAGE_STYLE}</style></head>
<body><header><h1>Local mail catcher</h1><a href="/">All mail</a>
<form method="post" action="/clear"><button type="submit">Delete all</button></form></header>
<main>${body}</main></body></html>`;
}

function renderList(inbox: readonly CaughtMail[]): string {
  if (inbox.length === 0) {
    return layout('Caught mail', '<p class="empty">No mail caught yet. Mail the app sends in development lands here.</p>');
  }
  const rows = inbox
    .map(
      (m) => `<tr><td>${escapeHtml(new Date(m.date).toLocaleString('en-GB'))}</td><td>${escapeHtml(m.from)}</td>
<td>${escapeHtml(m.to.join(', '))}</td><td><a href="/view/${m.id}">${escapeHtml(m.subject || '(no subject)')}</a></td></tr>`,
    )
    .join('');
  return layout(
    `Caught mail (${inbox.length})`,
    `<table><thead><tr><th>Time</th><th>From</th><th>To</th><th>Subject</th></tr></thead><tbody>${rows}</tbody></table>`,
  );
}

function renderMail(mail: CaughtMail): string {
  // The HTML body runs in a sandbox without scripts; <base> makes its links open in a new tab.
  const htmlPart =
    mail.html === null
      ? ''
      : `<h2>HTML</h2><iframe title="HTML body" sandbox="allow-popups allow-popups-to-escape-sandbox"
 srcdoc="${escapeHtml(`<base target="_blank">${mail.html}`)}"></iframe>`;
  return layout(
    mail.subject || '(no subject)',
    `<dl><dt>From</dt><dd>${escapeHtml(mail.from)}</dd><dt>To</dt><dd>${escapeHtml(mail.to.join(', '))}</dd>
<dt>Subject</dt><dd>${escapeHtml(mail.subject)}</dd><dt>Caught</dt><dd>${escapeHtml(mail.date)}</dd></dl>
<h2>Text</h2><pre>${linkify(mail.text)}</pre>${htmlPart}`,
  );
}
