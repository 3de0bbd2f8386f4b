import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';

const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

export type TokenScope = 'read' | 'write';

/** `GET /api/auth/tokens` rows (docs/api.md, "Personal API tokens"). */
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

export interface NewApiToken {
  readonly name: string;
  readonly teamId: string;
  readonly scope: TokenScope;
  readonly expiresInDays?: number;
}

/** The signed-in person's personal API tokens. */
@Injectable({ providedIn: 'root' })
export class ApiTokensApi {
  private readonly http = inject(HttpClient);

  list(): Observable<ApiToken[]> {
    return this.http.get<ApiToken[]>('/api/auth/tokens');
  }

  create(input: NewApiToken): Observable<CreatedApiToken> {
    return this.http.post<CreatedApiToken>('/api/auth/tokens', input, INLINE);
  }

  revoke(id: string): Observable<void> {
    return this.http.delete<void>(`/api/auth/tokens/${encodeURIComponent(id)}`);
  }
}
