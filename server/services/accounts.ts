/** Users: registration, credentials, profile, and the `Me` view of the API. */
import { createHash, randomBytes } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { and, asc, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Executor, Orm } from '../db/client.js';
import { memberships, passwordResets, teams, users } from '../db/schema.js';
import { DomainError } from '../../shared/errors.js';
import { makeToken, readToken } from '../http/signed-token.js';
import { enqueueMail } from '../mail/outbox.js';
import { mailText } from '../mail/messages.js';
import { revokeTokens } from './api-tokens.js';
import type { Me } from '../../shared/api/accounts.js';

/** Links in account mail: signing secret, the app's address, lifetimes. */
export interface AccountMailOptions {
  secret: string;
  publicUrl: string;
  passwordResetTtlMs: number;
  verificationTtlMs?: number;
}

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

/** `Me` as the server always fills it: whether the address is confirmed, and whether the person is an instructor. */
export type MeView = Me & { readonly user: { readonly emailVerified: boolean; readonly instructor: boolean } };

const resetLinkInvalid = () => new DomainError('invalid', 'reset_link_invalid', 'This reset link is not valid, was already used or has expired; ask for a new one');

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

export class Accounts {
  /** Compared against when the e-mail is unknown, at the same cost, so both failures take as long. */
  private dummyHash: Promise<string> | undefined;

  constructor(
    private readonly orm: Orm,
    private readonly bcryptRounds: number,
    private readonly mail: AccountMailOptions = { secret: 'unset', publicUrl: 'http://127.0.0.1', passwordResetTtlMs: 3_600_000 },
  ) {}

  hashPassword(password: string): Promise<string> {
    return bcrypt.hash(password, this.bcryptRounds);
  }

  async me(userId: string): Promise<MeView> {
    const [u] = await this.orm
      .select({ id: users.id, email: users.email, displayName: users.displayName, displayUnits: users.displayUnits, instructor: users.instructor, verifiedAt: users.emailVerifiedAt })
      .from(users)
      .where(eq(users.id, userId));
    if (!u) throw new DomainError('unauthenticated', 'unauthenticated', 'Please sign in');
    const { verifiedAt, ...user } = u;
    const rows = await this.orm
      .select({ teamId: teams.id, teamName: teams.name, teamSlug: teams.slug, roles: memberships.roles })
      .from(memberships)
      .innerJoin(teams, eq(teams.id, memberships.teamId))
      .where(eq(memberships.userId, userId))
      .orderBy(asc(teams.name));
    return { user: { ...user, emailVerified: verifiedAt !== null }, memberships: rows };
  }

  async register(input: { email: string; password: string; displayName: string }): Promise<string> {
    const email = normaliseEmail(input.email);
    const passwordHash = await this.hashPassword(input.password);
    return this.orm.transaction(async (tx) => {
      const rows = await tx
        .insert(users)
        .values({ email, passwordHash, displayName: input.displayName })
        .onConflictDoNothing({ target: users.email })
        .returning({ id: users.id });
      const row = rows[0];
      if (!row) throw new DomainError('conflict', 'email_taken', 'An account with that e-mail address already exists');
      await this.enqueueVerification(tx, row.id, email, input.displayName);
      return row.id;
    });
  }

  private async enqueueVerification(tx: Executor, userId: string, email: string, displayName: string): Promise<void> {
    const expiresAt = new Date(Date.now() + (this.mail.verificationTtlMs ?? 7 * 24 * 3_600_000));
    const token = makeToken(this.mail.secret, 'verify-email', { uid: userId, email }, expiresAt);
    const text = mailText.verifyEmail({ displayName, link: `${this.mail.publicUrl}/verify-email/${token}` });
    await enqueueMail(tx, { kind: 'verify-email', to: email, ...text });
  }

  /** Sends a new verification mail (the old links keep working until they expire). */
  async resendVerification(userId: string): Promise<void> {
    const [u] = await this.orm.select().from(users).where(eq(users.id, userId));
    if (!u) throw new DomainError('unauthenticated', 'unauthenticated', 'Please sign in');
    if (u.emailVerifiedAt) throw new DomainError('conflict', 'already_verified', 'Your e-mail address is already confirmed');
    await this.orm.transaction((tx) => this.enqueueVerification(tx, u.id, u.email, u.displayName));
  }

  /** Confirms the address the link was sent to (only if the account still uses it). */
  async verifyEmail(token: string): Promise<void> {
    const t = readToken<{ uid: string; email: string }>(this.mail.secret, 'verify-email', token);
    if (!t.ok || typeof t.payload.uid !== 'string' || typeof t.payload.email !== 'string') {
      throw new DomainError('invalid', 'verification_invalid', 'This confirmation link is not valid');
    }
    if (t.expired) throw new DomainError('gone', 'verification_expired', 'This confirmation link has expired; ask for a new one from your account page');
    const done = await this.orm
      .update(users)
      .set({ emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())` })
      .where(and(eq(users.id, t.payload.uid), eq(users.email, t.payload.email)))
      .returning({ id: users.id });
    if (!done.length) throw new DomainError('invalid', 'verification_invalid', 'This confirmation link is for an address the account no longer uses');
  }

  /** Mails a single-use reset link when the address has an account; says nothing either way. */
  async requestPasswordReset(emailRaw: string): Promise<void> {
    const [u] = await this.orm.select().from(users).where(eq(users.email, normaliseEmail(emailRaw)));
    if (!u) return;
    const token = randomBytes(32).toString('base64url');
    await this.orm.transaction(async (tx) => {
      await tx.insert(passwordResets).values({ tokenHash: sha256(token), userId: u.id, expiresAt: new Date(Date.now() + this.mail.passwordResetTtlMs) });
      const text = mailText.passwordReset({ displayName: u.displayName, link: `${this.mail.publicUrl}/reset-password/${token}`, minutes: Math.round(this.mail.passwordResetTtlMs / 60_000) });
      await enqueueMail(tx, { kind: 'password-reset', to: u.email, ...text });
    });
  }

  /** Uses a reset token once; returns the user whose password changed. */
  async resetPassword(token: string, newPassword: string): Promise<string> {
    // The link first: a link that is not valid costs a lookup, never a bcrypt hash.
    const [live] = await this.orm
      .select({ userId: passwordResets.userId })
      .from(passwordResets)
      .where(and(eq(passwordResets.tokenHash, sha256(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, sql`now()`)));
    if (!live) throw resetLinkInvalid();
    const passwordHash = await this.hashPassword(newPassword);
    return this.orm.transaction(async (tx) => {
      const [r] = await tx
        .update(passwordResets)
        .set({ usedAt: sql`now()` })
        .where(and(eq(passwordResets.tokenHash, sha256(token)), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, sql`now()`)))
        .returning({ userId: passwordResets.userId });
      // Used by a request racing this one, or expired while hashing.
      if (!r) throw resetLinkInvalid();
      // A link sent to the address also proves it.
      await tx.update(users).set({ passwordHash, emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())` }).where(eq(users.id, r.userId));
      // Whoever knew the old password may have made tokens with it: they all end.
      await revokeTokens(tx, { userId: r.userId });
      return r.userId;
    });
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
    if (!u) throw new DomainError('unauthenticated', 'unauthenticated', 'Please sign in');
    if (!(await bcrypt.compare(currentPassword, u.passwordHash))) {
      throw new DomainError('invalid', 'wrong_password', 'The current password is not correct', { fields: [{ path: 'currentPassword', message: 'not correct' }] });
    }
    const passwordHash = await this.hashPassword(newPassword);
    await this.orm.transaction(async (tx) => {
      await tx.update(users).set({ passwordHash }).where(eq(users.id, userId));
      // Every API token of the account ends with the old password.
      await revokeTokens(tx, { userId });
    });
  }

  async updateProfile(userId: string, patch: { displayName?: string | undefined; displayUnits?: 'si' | 'imperial' | undefined }): Promise<void> {
    const set: { displayName?: string; displayUnits?: 'si' | 'imperial' } = {};
    if (patch.displayName !== undefined) set.displayName = patch.displayName;
    if (patch.displayUnits !== undefined) set.displayUnits = patch.displayUnits;
    if (Object.keys(set).length) await this.orm.update(users).set(set).where(eq(users.id, userId));
  }
}
