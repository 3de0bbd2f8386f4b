/**
 * The mail outbox. Actions call `enqueueMail` inside their own transaction;
 * the worker (one per server process) claims due rows with
 * `FOR UPDATE SKIP LOCKED` (several processes never send the same row),
 * sends them over SMTP with nodemailer and marks them sent in the same
 * transaction. A failure schedules a retry with exponential back-off; after
 * `maxAttempts` the row is `failed` and stays for inspection. The
 * Message-ID is derived from the row id, so a resend after a crash between
 * sending and committing is the same message to the receiver.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import { sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { Executor, Orm } from '../db/client.js';
import { mailOutbox } from '../db/schema.js';

export interface OutgoingMail {
  kind: string;
  to: string;
  subject: string;
  text: string;
  teamId?: string | null | undefined;
  /** Same key twice = one mail (e.g. `review-requested:<configuration>:<revision>:<user>`). */
  dedupeKey?: string | undefined;
}

export async function enqueueMail(tx: Executor, mail: OutgoingMail | OutgoingMail[]): Promise<void> {
  const list = Array.isArray(mail) ? mail : [mail];
  if (!list.length) return;
  await tx
    .insert(mailOutbox)
    .values(list.map((m) => ({ kind: m.kind, toAddress: m.to, subject: m.subject, textBody: m.text, teamId: m.teamId ?? null, dedupeKey: m.dedupeKey ?? null })))
    .onConflictDoNothing();
}

export interface MailWorkerOptions {
  smtpUrl: string;
  from: string;
  pollMs: number;
  maxAttempts: number;
  /** First retry delay; doubles each attempt, capped at one hour. */
  backoffBaseMs: number;
  batchSize?: number;
  logger?: Logger;
}

export const messageIdFor = (outboxId: string) => `<${outboxId}@outbox.rollwise>`;

export class MailWorker {
  private readonly transport: Transporter;
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<number> | undefined;
  private stopped = false;

  constructor(
    private readonly orm: Orm,
    private readonly o: MailWorkerOptions,
  ) {
    this.transport = nodemailer.createTransport({
      url: o.smtpUrl,
      // Loopback development servers speak plain SMTP; a real relay URL can ask for TLS (smtps:// or ?secure=true).
      ignoreTLS: o.smtpUrl.startsWith('smtp://127.0.0.1') || o.smtpUrl.startsWith('smtp://localhost'),
      connectionTimeout: 5_000,
      greetingTimeout: 5_000,
      socketTimeout: 10_000,
    } as Parameters<typeof nodemailer.createTransport>[0]);
  }

  start(): void {
    const tick = () => {
      if (this.stopped) return;
      this.runOnce()
        .catch((err: unknown) => this.o.logger?.warn({ err }, 'mail worker: pass failed'))
        .finally(() => {
          if (!this.stopped) this.timer = setTimeout(tick, this.o.pollMs);
        });
    };
    this.timer = setTimeout(tick, 0);
  }

  /** Sends what is due now; returns how many were sent. One pass at a time per worker. */
  runOnce(): Promise<number> {
    return (this.running ??= this.pass().finally(() => (this.running = undefined)));
  }

  private async pass(): Promise<number> {
    return this.orm.transaction(async (tx) => {
      const due = await tx.execute<{ id: string; to_address: string; subject: string; text_body: string; attempts: number }>(sql`
        SELECT id, to_address, subject, text_body, attempts FROM mail_outbox
        WHERE status = 'pending' AND next_attempt_at <= now()
        ORDER BY created_at
        LIMIT ${this.o.batchSize ?? 20}
        FOR UPDATE SKIP LOCKED`);
      let sent = 0;
      for (const row of due.rows) {
        try {
          await this.transport.sendMail({
            from: this.o.from,
            to: row.to_address,
            subject: row.subject,
            text: row.text_body,
            textEncoding: 'base64',
            messageId: messageIdFor(row.id),
          });
          await tx.execute(sql`UPDATE mail_outbox SET status = 'sent', sent_at = now(), attempts = attempts + 1, last_error = NULL WHERE id = ${row.id}`);
          sent++;
        } catch (err) {
          const attempts = row.attempts + 1;
          const delayMs = Math.min(this.o.backoffBaseMs * 2 ** (attempts - 1), 3_600_000);
          const status = attempts >= this.o.maxAttempts ? 'failed' : 'pending';
          const message = err instanceof Error ? err.message : String(err);
          await tx.execute(sql`
            UPDATE mail_outbox SET attempts = ${attempts}, status = ${status}, last_error = ${message.slice(0, 500)},
              next_attempt_at = now() + make_interval(secs => ${delayMs / 1000})
            WHERE id = ${row.id}`);
          this.o.logger?.warn({ outboxId: row.id, attempts, err: message }, 'mail not sent; will retry');
          // The server is likely down: leave the rest for the next pass rather than waiting out each timeout.
          break;
        }
      }
      return sent;
    });
  }

  async stop(): Promise<void> {
    this.stopped = true;
    clearTimeout(this.timer);
    await this.running?.catch(() => undefined);
    this.transport.close();
  }
}
