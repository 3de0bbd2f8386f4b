import { inject } from '@angular/core';
import { CanActivateFn } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import { AuthService } from '../core/auth/auth-service';

/**
 * Pages open to everyone that still adapt to who is signed in (the links
 * Rollwise mails): wait until the app knows whether this browser holds a
 * session, then let everyone through. A mail link opens a fresh page load,
 * where nothing else would have asked yet.
 */
export const sessionKnownGuard: CanActivateFn = () =>
  inject(AuthService)
    .ensureLoaded()
    .pipe(
      map(() => true),
      catchError(() => of(true)),
    );
