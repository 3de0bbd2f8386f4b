/**
 * Development only (not mounted in production): the signed-in person's own
 * inbox on the local fake SMTP server, `GET /api/dev/mail`. Mail is shown
 * only to the account whose address it was sent to, never to a team or
 * anyone else, so no reset, confirmation or invitation link reaches anyone
 * but its addressee. An account whose address is not confirmed yet sees
 * only the confirmation mails sent to it since it was registered: until the
 * address is proved, mail to it (a reset link, an invitation) stays hidden,
 * so registering a colleague's address does not open their mailbox.
 * API tokens cannot read it (server/http/bearer.ts).
 */
import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { currentUser, type Authorizer } from '../http/authorize.js';
import { reply } from '../http/reply.js';
import type { CapturedMail } from '../../shared/api/accounts.js';

export function devMailRouter(orm: Orm, auth: Authorizer): Router {
  const r = Router();
  r.get('/', auth.requireUser, async (req, res) => {
    const me = currentUser(req).id;
    const rows = await orm.execute<{ id: string; message_id: string; from_address: string; to_addresses: string[]; subject: string; text_body: string; received_at: Date }>(sql`
      SELECT c.id, c.message_id, c.from_address, c.to_addresses, c.subject, c.text_body, c.received_at
      FROM captured_mail c
      JOIN users u ON u.id = ${me}
      WHERE EXISTS (SELECT 1 FROM unnest(c.to_addresses) AS a(address) WHERE lower(a.address) = u.email)
        AND (
          u.email_verified_at IS NOT NULL
          OR (
            c.received_at >= u.created_at
            AND EXISTS (SELECT 1 FROM mail_outbox o WHERE o.kind = 'verify-email' AND o.to_address = u.email AND c.message_id = '<' || o.id || '@outbox.rollwise>')
          )
        )
      ORDER BY c.received_at DESC
      LIMIT 200`);
    // Only the own address is shown as recipient.
    const email = currentUser(req).email;
    reply<CapturedMail[]>(
      res,
      rows.rows.map((m) => ({ id: m.id, messageId: m.message_id, from: m.from_address, to: [email], subject: m.subject, text: m.text_body, receivedAt: m.received_at })),
    );
  });
  return r;
}
