import { HttpClient, HttpContext } from '@angular/common/http';
import { inject, Injectable } from '@angular/core';
import { Observable } from 'rxjs';
import { SHOW_ERRORS_INLINE } from '../core/http/api-error';
import type { ApiToken, CreatedApiToken, TokenScope } from '../../../shared/api/accounts';

const INLINE = { context: new HttpContext().set(SHOW_ERRORS_INLINE, true) };

// The answers' types are the server's (shared/api/accounts.ts).
export type { ApiToken, CreatedApiToken, TokenScope } from '../../../shared/api/accounts';

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
