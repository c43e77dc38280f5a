import type { IncomingMessage } from 'node:http';
import type { Logger } from 'pino';
import { pinoHttp, type HttpLogger } from 'pino-http';

export const REDACTED = '[redacted]';

/** Headers that carry a session or a signature: pino drops their values before the line is written. */
const REDACT_PATHS = [
  'req.headers.authorization',
  'req.headers.cookie',
  'req.headers["stripe-signature"]',
  'res.headers["set-cookie"]',
];

// Query keys that hold a link's secret (invite, reset and supplier links, signed photo URLs).
const SECRET_QUERY_KEY = /token|signature|secret|password/i;

/**
 * The e-mailed and calendar links put their secret in the path: `/api/public/<kind>/<token>…` for the API and
 * `/q/<token>` for the client's quote page. Everything after the kind is the link, so all of it goes.
 */
const SECRET_PATHS: Array<[RegExp, string]> = [
  [/^(\/api\/public\/[^/]+\/).+$/, `$1${REDACTED}`],
  [/^(\/q\/).+$/, `$1${REDACTED}`],
];

/** The request URL as it may be logged: secrets in the path and in the query string replaced. */
export function redactUrl(url: string): string {
  const mark = url.indexOf('?');
  let path = mark === -1 ? url : url.slice(0, mark);
  const query = mark === -1 ? undefined : url.slice(mark + 1);
  for (const [pattern, replacement] of SECRET_PATHS) path = path.replace(pattern, replacement);
  if (query === undefined) return path;
  const pairs = query.split('&').map((pair) => {
    const equals = pair.indexOf('=');
    const key = equals === -1 ? pair : pair.slice(0, equals);
    let name = key;
    try {
      name = decodeURIComponent(key.replace(/\+/g, ' '));
    } catch {
      // A broken escape in the key: judge it by its raw spelling.
    }
    return SECRET_QUERY_KEY.test(name) ? `${key}=${REDACTED}` : pair;
  });
  return `${path}?${pairs.join('&')}`;
}

function redactRecord(record: unknown): unknown {
  if (!record || typeof record !== 'object') return record;
  return Object.fromEntries(
    Object.entries(record as Record<string, unknown>).map(([key, value]) => [key, SECRET_QUERY_KEY.test(key) ? REDACTED : value]),
  );
}

interface SerializedRequest {
  url?: string;
  query?: unknown;
  params?: unknown;
  [key: string]: unknown;
}

/** pino-http with every secret a request can carry kept out of the log: session headers, cookies and link tokens. */
export function requestLogger(logger: Logger, ignore?: (req: IncomingMessage) => boolean): HttpLogger {
  return pinoHttp({
    logger,
    redact: { paths: REDACT_PATHS, censor: REDACTED },
    serializers: {
      req: (req: SerializedRequest) => {
        if (typeof req.url === 'string') req.url = redactUrl(req.url);
        req.query = redactRecord(req.query);
        req.params = redactRecord(req.params);
        return req;
      },
    },
    ...(ignore ? { autoLogging: { ignore } } : {}),
  });
}
