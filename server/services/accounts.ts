/** Users: registration, credentials, profile, and the `Me` view of the API. */
import bcrypt from 'bcryptjs';
import { asc, eq } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { memberships, teams, users } from '../db/schema.js';
import { HttpError } from '../http/errors.js';
import type { Role } from '../permissions.js';

export interface Me {
  user: { id: string; email: string; displayName: string; displayUnits: 'si' | 'imperial'; instructor: boolean };
  memberships: { teamId: string; teamName: string; teamSlug: string; roles: Role[] }[];
}

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

export class Accounts {
  /** Compared against when the e-mail is unknown, at the same cost, so both failures take as long. */
  private dummyHash: Promise<string> | undefined;

  constructor(
    private readonly orm: Orm,
    private readonly bcryptRounds: number,
  ) {}

  hashPassword(password: string): Promise<string> {
    return bcrypt.hash(password, this.bcryptRounds);
  }

  async me(userId: string): Promise<Me> {
    const [u] = await this.orm
      .select({ id: users.id, email: users.email, displayName: users.displayName, displayUnits: users.displayUnits, instructor: users.instructor })
      .from(users)
      .where(eq(users.id, userId));
    if (!u) throw new HttpError(401, 'unauthenticated', 'Please sign in');
    const rows = await this.orm
      .select({ teamId: teams.id, teamName: teams.name, teamSlug: teams.slug, roles: memberships.roles })
      .from(memberships)
      .innerJoin(teams, eq(teams.id, memberships.teamId))
      .where(eq(memberships.userId, userId))
      .orderBy(asc(teams.name));
    return { user: u, memberships: rows.map((r) => ({ ...r, roles: r.roles as Role[] })) };
  }

  async register(input: { email: string; password: string; displayName: string }): Promise<string> {
    const email = normaliseEmail(input.email);
    const passwordHash = await this.hashPassword(input.password);
    const rows = await this.orm
      .insert(users)
      .values({ email, passwordHash, displayName: input.displayName })
      .onConflictDoNothing({ target: users.email })
      .returning({ id: users.id });
    const row = rows[0];
    if (!row) throw new HttpError(409, 'email_taken', 'An account with that e-mail address already exists');
    return row.id;
  }

  /** The user id when the credentials match; null otherwise (same cost either way). */
  async verify(emailRaw: string, password: string): Promise<string | null> {
    const [u] = await this.orm
      .select({ id: users.id, passwordHash: users.passwordHash })
      .from(users)
      .where(eq(users.email, normaliseEmail(emailRaw)));
    const ok = await bcrypt.compare(password, u?.passwordHash ?? (await (this.dummyHash ??= this.hashPassword('rollwise-no-such-user'))));
    return ok && u ? u.id : null;
  }

  async changePassword(userId: string, currentPassword: string, newPassword: string): Promise<void> {
    const [u] = await this.orm.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, userId));
    if (!u) throw new HttpError(401, 'unauthenticated', 'Please sign in');
    if (!(await bcrypt.compare(currentPassword, u.passwordHash))) {
      throw new HttpError(400, 'wrong_password', 'The current password is not correct', { fields: [{ path: 'currentPassword', message: 'not correct' }] });
    }
    await this.orm.update(users).set({ passwordHash: await this.hashPassword(newPassword) }).where(eq(users.id, userId));
  }

  async updateProfile(userId: string, patch: { displayName?: string | undefined; displayUnits?: 'si' | 'imperial' | undefined }): Promise<void> {
    const set: { displayName?: string; displayUnits?: 'si' | 'imperial' } = {};
    if (patch.displayName !== undefined) set.displayName = patch.displayName;
    if (patch.displayUnits !== undefined) set.displayUnits = patch.displayUnits;
    if (Object.keys(set).length) await this.orm.update(users).set(set).where(eq(users.id, userId));
  }
}
