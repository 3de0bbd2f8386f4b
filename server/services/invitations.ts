/**
 * Team invitations by e-mail. The owner invites an address with roles; the
 * mail (enqueued in the same transaction) carries a signed link that expires.
 * Reading the invitation never changes anything; accepting is a POST, once:
 * a signed-in user whose address matches joins the team, a new person
 * registers straight into it (the link proves the address).
 */
import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { memberships, teamInvitations, teams, users } from '../db/schema.js';
import { HttpError } from '../http/errors.js';
import { makeToken, readToken } from '../http/signed-token.js';
import { enqueueMail } from '../mail/outbox.js';
import { mailText } from '../mail/messages.js';
import type { Role } from '../permissions.js';
import { normaliseEmail, type Accounts } from './accounts.js';
import { recordActivity } from './activity.js';

const invalid = () => new HttpError(404, 'invitation_invalid', 'This invitation link is not valid; ask the team owner for a new one');
const expired = () => new HttpError(410, 'invitation_expired', 'This invitation has expired; ask the team owner for a new one');
const used = () => new HttpError(410, 'invitation_used', 'This invitation has already been accepted');

export interface InvitationInfo {
  teamId: string;
  teamName: string;
  email: string;
  roles: Role[];
  invitedByName: string | null;
  expiresAt: Date;
  /** An account with the invited address exists: sign in with it to accept. */
  accountExists: boolean;
}

export class Invitations {
  constructor(
    private readonly orm: Orm,
    private readonly accounts: Accounts,
    private readonly o: { secret: string; publicUrl: string; ttlMs: number },
  ) {}

  link(token: string): string {
    return `${this.o.publicUrl}/invitations/${token}`;
  }

  async create(teamId: string, inviterId: string, input: { email: string; roles: Role[] }) {
    const email = normaliseEmail(input.email);
    const [member] = await this.orm
      .select({ name: users.displayName })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.teamId, teamId), eq(users.email, email)));
    if (member) throw new HttpError(409, 'already_member', `${member.name} is already a member of this team`);
    const expiresAt = new Date(Date.now() + this.o.ttlMs);
    return this.orm.transaction(async (tx) => {
      const [inv] = await tx.insert(teamInvitations).values({ teamId, email, roles: input.roles, invitedBy: inviterId, expiresAt }).returning();
      const [team] = await tx.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
      const [inviter] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, inviterId));
      const token = makeToken(this.o.secret, 'invitation', { id: inv!.id }, expiresAt);
      const text = mailText.invitation({ teamName: team!.name, inviterName: inviter?.name ?? 'A team owner', roles: input.roles, link: this.link(token), expiresAt });
      await enqueueMail(tx, { kind: 'invitation', to: email, teamId, ...text, dedupeKey: `invitation:${inv!.id}` });
      await recordActivity(tx, { teamId, actorId: inviterId, action: 'invitation.create', subjectType: 'invitation', subjectId: inv!.id, summary: `Invited ${email} as ${input.roles.join(', ')}` });
      return { id: inv!.id, email, roles: input.roles as Role[], expiresAt, acceptedAt: null };
    });
  }

  async list(teamId: string) {
    return this.orm
      .select({ id: teamInvitations.id, email: teamInvitations.email, roles: teamInvitations.roles, invitedByName: users.displayName, expiresAt: teamInvitations.expiresAt, acceptedAt: teamInvitations.acceptedAt, createdAt: teamInvitations.createdAt })
      .from(teamInvitations)
      .leftJoin(users, eq(users.id, teamInvitations.invitedBy))
      .where(eq(teamInvitations.teamId, teamId))
      .orderBy(desc(teamInvitations.createdAt));
  }

  private async load(token: string) {
    const t = readToken<{ id: string }>(this.o.secret, 'invitation', token);
    if (!t.ok || typeof t.payload.id !== 'string') throw invalid();
    const [inv] = await this.orm
      .select({
        id: teamInvitations.id,
        teamId: teamInvitations.teamId,
        teamName: teams.name,
        email: teamInvitations.email,
        roles: teamInvitations.roles,
        invitedByName: users.displayName,
        expiresAt: teamInvitations.expiresAt,
        acceptedAt: teamInvitations.acceptedAt,
      })
      .from(teamInvitations)
      .innerJoin(teams, eq(teams.id, teamInvitations.teamId))
      .leftJoin(users, eq(users.id, teamInvitations.invitedBy))
      .where(eq(teamInvitations.id, t.payload.id));
    if (!inv) throw invalid();
    if (inv.acceptedAt) throw used();
    if (t.expired || inv.expiresAt.getTime() <= Date.now()) throw expired();
    return inv;
  }

  /** What the invitation page shows. Changes nothing. */
  async info(token: string): Promise<InvitationInfo> {
    const inv = await this.load(token);
    const [u] = await this.orm.select({ id: users.id }).from(users).where(eq(users.email, inv.email));
    return { teamId: inv.teamId, teamName: inv.teamName, email: inv.email, roles: inv.roles as Role[], invitedByName: inv.invitedByName, expiresAt: inv.expiresAt, accountExists: !!u };
  }

  /**
   * Accepts once. `userId`: the signed-in user (their address must be the invited one);
   * otherwise `register` creates the account for the invited address. Returns the member's user id.
   */
  async accept(token: string, who: { userId: string; email: string } | { register: { displayName: string; password: string } }): Promise<{ userId: string; teamId: string }> {
    const inv = await this.load(token);
    if ('userId' in who && normaliseEmail(who.email) !== inv.email) {
      throw new HttpError(403, 'wrong_email', 'This invitation is for another e-mail address; sign in with the invited address');
    }
    const passwordHash = 'register' in who ? await this.accounts.hashPassword(who.register.password) : null;
    return this.orm.transaction(async (tx) => {
      const [claimed] = await tx
        .update(teamInvitations)
        .set({ acceptedAt: sql`now()` })
        .where(and(eq(teamInvitations.id, inv.id), isNull(teamInvitations.acceptedAt), gt(teamInvitations.expiresAt, sql`now()`)))
        .returning({ id: teamInvitations.id });
      if (!claimed) throw used();
      let userId: string;
      if ('userId' in who) userId = who.userId;
      else {
        const rows = await tx
          .insert(users)
          .values({ email: inv.email, displayName: who.register.displayName, passwordHash: passwordHash!, emailVerifiedAt: sql`now()` })
          .onConflictDoNothing({ target: users.email })
          .returning({ id: users.id });
        if (!rows[0]) throw new HttpError(409, 'email_taken', 'An account with this address exists: sign in with it, then accept the invitation');
        userId = rows[0].id;
      }
      const added = await tx.insert(memberships).values({ teamId: inv.teamId, userId, roles: inv.roles }).onConflictDoNothing().returning();
      if (!added.length) throw new HttpError(409, 'already_member', 'You are already a member of this team');
      await tx.update(teamInvitations).set({ acceptedBy: userId }).where(eq(teamInvitations.id, inv.id));
      await recordActivity(tx, { teamId: inv.teamId, actorId: userId, action: 'invitation.accept', subjectType: 'invitation', subjectId: inv.id, summary: `${inv.email} accepted the invitation as ${inv.roles.join(', ')}` });
      return { userId, teamId: inv.teamId };
    });
  }
}
