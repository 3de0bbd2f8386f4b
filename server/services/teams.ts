/** Teams and memberships, with last-owner protection. */
import { and, asc, eq } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { configurationApprovals, configurations, memberships, teams, users } from '../db/schema.js';
import { revokeTokens } from './api-tokens.js';
import { DomainError, notFound } from '../../shared/errors.js';
import { permissionsOf, type Role } from '../permissions.js';
import { recordActivity } from './activity.js';
import type { TeamMember, TeamSummary } from '../../shared/api/teams.js';

const lastOwner = () => new DomainError('conflict', 'last_owner', 'A team needs at least one owner: make someone else an owner first');

export class Teams {
  constructor(private readonly orm: Orm) {}

  async listFor(userId: string): Promise<TeamSummary[]> {
    const rows = await this.orm
      .select({ id: teams.id, name: teams.name, slug: teams.slug, roles: memberships.roles })
      .from(memberships)
      .innerJoin(teams, eq(teams.id, memberships.teamId))
      .where(eq(memberships.userId, userId))
      .orderBy(asc(teams.name));
    return rows;
  }

  async detail(teamId: string, roles: Role[]) {
    const [t] = await this.orm.select({ id: teams.id, name: teams.name, slug: teams.slug }).from(teams).where(eq(teams.id, teamId));
    if (!t) throw notFound('Team');
    return { ...t, roles, permissions: permissionsOf(roles) };
  }

  async create(userId: string, input: { name: string; slug: string }): Promise<TeamSummary> {
    return this.orm.transaction(async (tx) => {
      const [t] = await tx.insert(teams).values(input).onConflictDoNothing({ target: teams.slug }).returning();
      if (!t) throw new DomainError('conflict', 'slug_taken', `The address "${input.slug}" is already used by another team`);
      await tx.insert(memberships).values({ teamId: t.id, userId, roles: ['owner'] });
      return { id: t.id, name: t.name, slug: t.slug, roles: ['owner'] };
    });
  }

  async rename(teamId: string, name: string, roles: Role[]) {
    await this.orm.update(teams).set({ name }).where(eq(teams.id, teamId));
    return this.detail(teamId, roles);
  }

  /** Deletes the team and everything in it, unless it holds approvals: approved work is archived, never deleted. */
  async remove(teamId: string): Promise<void> {
    const [a] = await this.orm
      .select({ id: configurationApprovals.id })
      .from(configurationApprovals)
      .innerJoin(configurations, eq(configurations.id, configurationApprovals.configurationId))
      .where(eq(configurations.teamId, teamId))
      .limit(1);
    if (a) throw new DomainError('conflict', 'has_approvals', 'This team has approved configurations; approved work is kept: archive its vehicles and designs instead');
    await this.orm.delete(teams).where(eq(teams.id, teamId));
  }

  async members(teamId: string): Promise<TeamMember[]> {
    const rows = await this.orm
      .select({ userId: users.id, email: users.email, displayName: users.displayName, roles: memberships.roles })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(eq(memberships.teamId, teamId))
      .orderBy(asc(users.displayName));
    return rows;
  }

  /** Changes roles (roles given) or removes the member (roles null), never leaving the team without an owner. */
  async changeMember(teamId: string, userId: string, roles: Role[] | null, actorId: string | null = null): Promise<TeamMember | null> {
    return this.orm.transaction(async (tx) => {
      // Lock the team's memberships so two concurrent demotions cannot both pass the owner count.
      const all = await tx
        .select({ userId: memberships.userId, roles: memberships.roles })
        .from(memberships)
        .where(eq(memberships.teamId, teamId))
        .for('update');
      const target = all.find((m) => m.userId === userId);
      if (!target) throw notFound('Member');
      const ownersAfter = all.filter((m) => (m.userId === userId ? roles?.includes('owner') : m.roles.includes('owner'))).length;
      if (ownersAfter === 0) throw lastOwner();
      const where = and(eq(memberships.teamId, teamId), eq(memberships.userId, userId));
      const [u] = await tx.select({ email: users.email, displayName: users.displayName }).from(users).where(eq(users.id, userId));
      const who = u?.displayName ?? 'a member';
      if (roles === null) {
        await tx.delete(memberships).where(where);
        // Their API tokens for this team end for good: being invited back does not revive them.
        await revokeTokens(tx, { userId, teamId });
        const summary = actorId === userId ? `${who} left the team` : `Removed ${who}`;
        await recordActivity(tx, { teamId, actorId, action: 'member.remove', subjectType: 'member', subjectId: userId, summary });
        return null;
      }
      await tx.update(memberships).set({ roles }).where(where);
      await recordActivity(tx, { teamId, actorId, action: 'member.roles', subjectType: 'member', subjectId: userId, summary: `Roles of ${who}: ${target.roles.join(', ')} → ${roles.join(', ')}` });
      return { userId, email: u?.email ?? '', displayName: u?.displayName ?? '', roles };
    });
  }
}
