/**
 * A local fake SMTP server for development and tests (the smtp-server
 * package), listening on loopback only. It accepts every message, keeps it
 * in memory and hands it to an optional `store` (the server writes it to the
 * captured_mail table, shown by the development mail API). Messages are
 * de-duplicated by Message-ID, as a real mailbox would show a resend once.
 * Never started in production.
 */
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';

export interface CapturedMessage {
  messageId: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  receivedAt: Date;
}

export interface FakeSmtp {
  port: number;
  /** smtp://127.0.0.1:port, for SMTP_URL. */
  url: string;
  readonly messages: readonly CapturedMessage[];
  /** Resolves with the first message (already received or arriving) that matches, or rejects after timeoutMs. */
  waitFor(match: (m: CapturedMessage) => boolean, timeoutMs?: number): Promise<CapturedMessage>;
  close(): Promise<void>;
}

/** RFC 2047 encoded words (=?utf-8?B?…?= / ?Q?) in a header value. */
function decodeWords(value: string): string {
  return value.replace(/=\?([^?]+)\?([bqBQ])\?([^?]*)\?=\s*/g, (_m, _charset: string, enc: string, data: string) =>
    enc.toUpperCase() === 'B'
      ? Buffer.from(data, 'base64').toString('utf8')
      : Buffer.from(data.replace(/_/g, ' ').replace(/=([0-9A-F]{2})/gi, (_x, h: string) => String.fromCharCode(parseInt(h, 16))), 'latin1').toString('utf8'),
  );
}

function decodeBody(body: string, encoding: string): string {
  const e = encoding.toLowerCase();
  if (e === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  if (e === 'quoted-printable') {
    const bytes = body.replace(/=\r?\n/g, '').replace(/=([0-9A-F]{2})/gi, (_x, h: string) => String.fromCharCode(parseInt(h, 16)));
    return Buffer.from(bytes, 'latin1').toString('utf8');
  }
  return body;
}

/** Headers and the text of a single-part message (what Rollwise sends). */
export function parseMessage(raw: string): { headers: Map<string, string>; text: string } {
  const split = raw.search(/\r?\n\r?\n/);
  const head = split < 0 ? raw : raw.slice(0, split);
  const body = split < 0 ? '' : raw.slice(split).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':');
    if (i > 0) headers.set(line.slice(0, i).trim().toLowerCase(), decodeWords(line.slice(i + 1).trim()));
  }
  return { headers, text: decodeBody(body, headers.get('content-transfer-encoding') ?? '7bit').replace(/\r\n/g, '\n') };
}

export async function startFakeSmtp(o: { port?: number; host?: string; store?: (m: CapturedMessage) => Promise<void> } = {}): Promise<FakeSmtp> {
  const messages: CapturedMessage[] = [];
  const waiters = new Set<{ match: (m: CapturedMessage) => boolean; resolve: (m: CapturedMessage) => void }>();
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    size: 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const { headers, text } = parseMessage(Buffer.concat(chunks).toString('utf8'));
        const m: CapturedMessage = {
          messageId: headers.get('message-id') ?? `<local-${Date.now()}-${messages.length}>`,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: headers.get('subject') ?? '',
          text,
          receivedAt: new Date(),
        };
        if (messages.some((x) => x.messageId === m.messageId)) return callback();
        // Listed (and waiters told) only once stored: whoever waited for a message can read it from the store.
        (o.store ? o.store(m) : Promise.resolve()).then(
          () => {
            if (!messages.some((x) => x.messageId === m.messageId)) messages.push(m);
            for (const w of waiters) {
              if (!w.match(m)) continue;
              waiters.delete(w);
              w.resolve(m);
            }
            callback();
          },
          (err: Error) => callback(err),
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(o.port ?? 0, o.host ?? '127.0.0.1', () => resolve());
  });
  server.on('error', () => undefined);
  const { port } = server.server.address() as AddressInfo;
  return {
    port,
    url: `smtp://127.0.0.1:${port}`,
    messages,
    waitFor(match, timeoutMs = 10_000) {
      const found = messages.find(match);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const w = { match, resolve: (m: CapturedMessage) => (clearTimeout(timer), resolve(m)) };
        const timer = setTimeout(() => (waiters.delete(w), reject(new Error('no matching mail arrived in time'))), timeoutMs);
        waiters.add(w);
      });
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
