/**
 * Response types of the account API (docs/api.md, "Accounts" and "Personal
 * API tokens"), as they travel: timestamps are ISO 8601 UTC strings. The
 * server's handlers are checked against them (server/http/reply.ts) and the
 * app's data access reads them; framework-free types only.
 */
import type { Role } from '../schema/roles.js';

export type DisplayUnits = 'si' | 'imperial';

export interface User {
  readonly id: string;
  readonly email: string;
  readonly displayName: string;
  readonly displayUnits: DisplayUnits;
  /** The address was confirmed (verification link, invitation or password reset). */
  readonly emailVerified?: boolean;
  /** May create programmes (an account property, not a team role). */
  readonly instructor?: boolean;
}

export interface Membership {
  readonly teamId: string;
  readonly teamName: string;
  readonly teamSlug: string;
  readonly roles: readonly Role[];
}

/** `GET /api/auth/me`, also returned by sign-in, register and profile updates. */
export interface Me {
  readonly user: User;
  readonly memberships: readonly Membership[];
}

export type TokenScope = 'read' | 'write';

/** `GET /api/auth/tokens` rows. */
export interface ApiToken {
  readonly id: string;
  readonly name: string;
  readonly teamId: string;
  readonly teamName: string;
  readonly scope: TokenScope;
  /** The first characters of the secret, to recognise it. */
  readonly prefix: string;
  readonly expiresAt: string | null;
  readonly lastUsedAt: string | null;
  readonly revokedAt: string | null;
  readonly createdAt: string;
}

/** The answer to creating one: the secret is in it this once only. */
export interface CreatedApiToken extends ApiToken {
  readonly token: string;
}

/** `GET /api/dev/mail` rows (development servers only): what the local fake SMTP server captured for the signed-in person. */
export interface CapturedMail {
  readonly id: string;
  readonly messageId: string;
  readonly from: string;
  readonly to: readonly string[];
  readonly subject: string;
  readonly text: string;
  readonly receivedAt: string;
}
