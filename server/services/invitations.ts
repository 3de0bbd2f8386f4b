/**
 * Team invitations by e-mail: the only way into a team besides creating it.
 * The owner invites an address with roles; the mail (enqueued in the same
 * transaction) carries a signed link that expires. Inviting answers alike
 * whether or not the address has an account, and reading the invitation
 * does not say either. Reading never changes anything; accepting is a POST,
 * once: a signed-in user whose *confirmed* address is the invited one joins
 * the team (an unconfirmed account cannot squat a colleague's address), or
 * a new person registers straight into it (the link proves the address).
 * Until then the invited person is no member and holds no role.
 */
import { and, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { memberships, teamInvitations, teams, users } from '../db/schema.js';
import { DomainError } from '../../shared/errors.js';
import { makeToken, readToken } from '../http/signed-token.js';
import { enqueueMail } from '../mail/outbox.js';
import { mailText } from '../mail/messages.js';
import type { Role } from '../permissions.js';
import { normaliseEmail, type Accounts } from './accounts.js';
import { recordActivity } from './activity.js';
import type { InvitationInfo as InvitationInfoWire } from '../../shared/api/teams.js';

const invalid = () => new DomainError('not_found', 'invitation_invalid', 'This invitation link is not valid; ask the team owner for a new one');
const expired = () => new DomainError('gone', 'invitation_expired', 'This invitation has expired; ask the team owner for a new one');
const used = () => new DomainError('gone', 'invitation_used', 'This invitation has already been accepted');

/** What the invitation page shows (`expiresAt` still a Date). */
export type InvitationInfo = Omit<InvitationInfoWire, 'expiresAt'> & { expiresAt: Date };

export class Invitations {
  constructor(
    private readonly orm: Orm,
    private readonly accounts: Accounts,
    private readonly o: { secret: string; publicUrl: string; ttlMs: number },
  ) {}

  link(token: string): string {
    return `${this.o.publicUrl}/invitations/${token}`;
  }

  /** `o.mail: false` only for the demo seed, which accepts at once for its invented people. */
  async create(teamId: string, inviterId: string, input: { email: string; roles: Role[] }, o: { mail?: boolean } = {}) {
    const email = normaliseEmail(input.email);
    const [member] = await this.orm
      .select({ userId: users.id })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.teamId, teamId), eq(users.email, email)));
    // Owners see their members' addresses anyway; the answer names nobody.
    if (member) throw new DomainError('conflict', 'already_member', 'That address belongs to a member of this team already');
    const expiresAt = new Date(Date.now() + this.o.ttlMs);
    return this.orm.transaction(async (tx) => {
      const [inv] = await tx.insert(teamInvitations).values({ teamId, email, roles: input.roles, invitedBy: inviterId, expiresAt }).returning();
      const [team] = await tx.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
      const [inviter] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, inviterId));
      const token = makeToken(this.o.secret, 'invitation', { id: inv!.id }, expiresAt);
      const text = mailText.invitation({ teamName: team!.name, inviterName: inviter?.name ?? 'A team owner', roles: input.roles, link: this.link(token), expiresAt });
      if (o.mail !== false) await enqueueMail(tx, { kind: 'invitation', to: email, teamId, ...text, dedupeKey: `invitation:${inv!.id}` });
      await recordActivity(tx, { teamId, actorId: inviterId, action: 'invitation.create', subjectType: 'invitation', subjectId: inv!.id, summary: `Invited ${email} as ${input.roles.join(', ')}` });
      return { id: inv!.id, email, roles: input.roles, expiresAt, acceptedAt: null };
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
    // Whether the address has an account is not said: the page offers signing in and registering alike.
    return { teamId: inv.teamId, teamName: inv.teamName, email: inv.email, roles: inv.roles, invitedByName: inv.invitedByName, expiresAt: inv.expiresAt };
  }

  /**
   * Accepts once. `userId`: the signed-in user (their address must be the invited one);
   * otherwise `register` creates the account for the invited address. Returns the member's user id.
   */
  async accept(
    token: string,
    who: { userId: string; email: string; emailVerified: boolean } | { register: { displayName: string; password: string } },
  ): Promise<{ userId: string; teamId: string }> {
    return this.acceptLoaded(await this.load(token), who);
  }

  /** The demo seed's invented people accept their invitations (their addresses are the seed's own). */
  async acceptForSeed(invitationId: string, user: { userId: string; email: string }): Promise<void> {
    const [inv] = await this.orm
      .select({ id: teamInvitations.id, teamId: teamInvitations.teamId, email: teamInvitations.email, roles: teamInvitations.roles })
      .from(teamInvitations)
      .where(eq(teamInvitations.id, invitationId));
    if (!inv) throw invalid();
    await this.acceptLoaded(inv, { ...user, emailVerified: true });
  }

  private async acceptLoaded(
    inv: { id: string; teamId: string; email: string; roles: Role[] },
    who: { userId: string; email: string; emailVerified: boolean } | { register: { displayName: string; password: string } },
  ): Promise<{ userId: string; teamId: string }> {
    if ('userId' in who && normaliseEmail(who.email) !== inv.email) {
      throw new DomainError('forbidden', 'wrong_email', 'This invitation is for another e-mail address; sign in with the invited address');
    }
    // Membership binds to a confirmed address: an account registered with someone else's address cannot take their place.
    if ('userId' in who && !who.emailVerified) {
      throw new DomainError('forbidden', 'email_unverified', 'Confirm your e-mail address first (the link is in the mail we sent when you registered; your account page sends a new one), then accept');
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
        if (!rows[0]) throw new DomainError('conflict', 'email_taken', 'This address already has an account: sign in with it (or reset its password), then accept the invitation');
        userId = rows[0].id;
      }
      const added = await tx.insert(memberships).values({ teamId: inv.teamId, userId, roles: inv.roles }).onConflictDoNothing().returning();
      if (!added.length) throw new DomainError('conflict', 'already_member', 'You are already a member of this team');
      await tx.update(teamInvitations).set({ acceptedBy: userId }).where(eq(teamInvitations.id, inv.id));
      await recordActivity(tx, { teamId: inv.teamId, actorId: userId, action: 'invitation.accept', subjectType: 'invitation', subjectId: inv.id, summary: `${inv.email} accepted the invitation as ${inv.roles.join(', ')}` });
      return { userId, teamId: inv.teamId };
    });
  }
}
