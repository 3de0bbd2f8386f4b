/**
 * Development only (not mounted in production): the mail the local fake SMTP
 * server captured for a team — mail to its members and mail the team caused
 * (invitations, review mail) — for the team's owner.
 */
import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { currentAccess, type Authorizer } from '../http/authorize.js';

export function devMailRouter(orm: Orm, auth: Authorizer): Router {
  const r = Router({ mergeParams: true });
  r.get('/', auth.requirePermission('members:manage'), async (req, res) => {
    const teamId = currentAccess(req).teamId;
    const rows = await orm.execute<{ id: string; message_id: string; from_address: string; to_addresses: string[]; subject: string; text_body: string; received_at: Date }>(sql`
      SELECT c.id, c.message_id, c.from_address, c.to_addresses, c.subject, c.text_body, c.received_at
      FROM captured_mail c
      WHERE c.to_addresses && ARRAY(SELECT u.email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.team_id = ${teamId})
         OR EXISTS (SELECT 1 FROM mail_outbox o WHERE o.team_id = ${teamId} AND c.message_id = '<' || o.id || '@outbox.rollwise>')
      ORDER BY c.received_at DESC
      LIMIT 200`);
    res.json(
      rows.rows.map((m) => ({ id: m.id, messageId: m.message_id, from: m.from_address, to: m.to_addresses, subject: m.subject, text: m.text_body, receivedAt: m.received_at })),
    );
  });
  return r;
}
