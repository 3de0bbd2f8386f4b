/**
 * Personal API tokens: `rw_<43 random base64url chars>`, shown once at
 * creation; the database keeps only a SHA-256 of it (a token has 256 bits of
 * entropy, so a fast hash is enough — no password stretching needed).
 */
import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, isNull, sql } from 'drizzle-orm';
import type { Executor, Orm } from '../db/client.js';
import { apiTokens, memberships, teams, users, type TokenScope } from '../db/schema.js';
import { DomainError, notFound } from '../../shared/errors.js';
import type { SessionUser } from '../http/authorize.js';

export const TOKEN_PREFIX = 'rw_';
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/**
 * Revokes every live token of a user (or only those for one team): a password change or reset
 * ends them all, leaving or being removed from a team ends that team's. Revoked is final.
 */
export async function revokeTokens(tx: Executor, o: { userId: string; teamId?: string }): Promise<void> {
  await tx
    .update(apiTokens)
    .set({ revokedAt: sql`now()` })
    .where(and(eq(apiTokens.userId, o.userId), isNull(apiTokens.revokedAt), o.teamId ? eq(apiTokens.teamId, o.teamId) : undefined));
}

export interface TokenGrant {
  tokenId: string;
  teamId: string;
  scope: TokenScope;
}

export class ApiTokens {
  constructor(private readonly orm: Orm) {}

  async create(userId: string, input: { name: string; teamId: string; scope: TokenScope; expiresInDays?: number | undefined }) {
    const [m] = await this.orm
      .select({ teamId: memberships.teamId })
      .from(memberships)
      .where(and(eq(memberships.userId, userId), eq(memberships.teamId, input.teamId)));
    if (!m) throw new DomainError('not_found', 'not_found', 'Team not found', { field: 'teamId' });
    const token = TOKEN_PREFIX + randomBytes(32).toString('base64url');
    const expiresAt = input.expiresInDays ? new Date(Date.now() + input.expiresInDays * 86_400_000) : null;
    const [row] = await this.orm
      .insert(apiTokens)
      .values({ userId, teamId: input.teamId, name: input.name, scope: input.scope, tokenHash: hashToken(token), prefix: token.slice(0, 10), expiresAt })
      .returning({ id: apiTokens.id });
    return { ...(await this.get(userId, row!.id)), token };
  }

  private columns() {
    return {
      id: apiTokens.id,
      name: apiTokens.name,
      teamId: apiTokens.teamId,
      teamName: teams.name,
      scope: apiTokens.scope,
      prefix: apiTokens.prefix,
      expiresAt: apiTokens.expiresAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
      createdAt: apiTokens.createdAt,
    };
  }

  async get(userId: string, id: string) {
    const [t] = await this.orm
      .select(this.columns())
      .from(apiTokens)
      .innerJoin(teams, eq(teams.id, apiTokens.teamId))
      .where(and(eq(apiTokens.id, id), eq(apiTokens.userId, userId)));
    if (!t) throw notFound('Token');
    return t;
  }

  async list(userId: string) {
    return this.orm
      .select(this.columns())
      .from(apiTokens)
      .innerJoin(teams, eq(teams.id, apiTokens.teamId))
      .where(eq(apiTokens.userId, userId))
      .orderBy(desc(apiTokens.createdAt));
  }

  async revoke(userId: string, id: string): Promise<void> {
    await this.get(userId, id);
    await this.orm
      .update(apiTokens)
      .set({ revokedAt: sql`now()` })
      .where(and(eq(apiTokens.id, id), isNull(apiTokens.revokedAt)));
  }

  /** The user and grant of a live token, or null (unknown, revoked, expired). */
  async authenticate(token: string): Promise<{ user: SessionUser; grant: TokenGrant } | null> {
    if (!token.startsWith(TOKEN_PREFIX) || token.length > 200) return null;
    const [r] = await this.orm
      .update(apiTokens)
      .set({ lastUsedAt: sql`now()` })
      .where(
        and(
          eq(apiTokens.tokenHash, hashToken(token)),
          isNull(apiTokens.revokedAt),
          sql`(${apiTokens.expiresAt} IS NULL OR ${apiTokens.expiresAt} > now())`,
          // Only while its holder is a member of its team (leaving also revokes it; this covers any path that did not).
          sql`EXISTS (SELECT 1 FROM ${memberships} WHERE ${memberships.userId} = ${apiTokens.userId} AND ${memberships.teamId} = ${apiTokens.teamId})`,
        ),
      )
      .returning({ id: apiTokens.id, userId: apiTokens.userId, teamId: apiTokens.teamId, scope: apiTokens.scope });
    if (!r) return null;
    const [u] = await this.orm
      .select({ id: users.id, email: users.email, displayName: users.displayName, displayUnits: users.displayUnits, instructor: users.instructor })
      .from(users)
      .where(eq(users.id, r.userId));
    if (!u) return null;
    return { user: u, grant: { tokenId: r.id, teamId: r.teamId, scope: r.scope } };
  }
}
