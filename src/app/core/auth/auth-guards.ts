import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { map } from 'rxjs';
import { AuthService } from './auth-service';

/** Lets signed-in users through; others go to the sign-in page and come back after. */
export const signedInGuard: CanActivateFn = (_route, state) => {
  const auth = inject(AuthService);
  const router = inject(Router);
  return auth
    .ensureLoaded()
    .pipe(
      map((me) =>
        me ? true : router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } }),
      ),
    );
};

/** Sign-in and register pages: a signed-in user is sent home instead. */
export const signedOutGuard: CanActivateFn = () => {
  const auth = inject(AuthService);
  const router = inject(Router);
  return auth.ensureLoaded().pipe(map((me) => (me ? router.parseUrl(homeUrl(auth)) : true)));
};

/** The empty path: the signed-in person's landing page (homeUrl), or sign-in. */
export const homeRedirectGuard: CanActivateFn = () => {
  const auth = inject(AuthService);
  const router = inject(Router);
  return auth
    .ensureLoaded()
    .pipe(map((me) => router.parseUrl(me ? homeUrl(auth) : '/sign-in')));
};

/**
 * Where a signed-in person lands, by role: an instructor on their programmes;
 * anyone else on the team they last worked in (remembered by this browser),
 * else their first team, else the team list (where a new account starts).
 */
export function homeUrl(auth: Pick<AuthService, 'user' | 'currentTeam'>): string {
  if (auth.user()?.instructor) return '/programmes';
  const team = auth.currentTeam();
  return team ? `/teams/${encodeURIComponent(team.teamId)}` : '/teams';
}

/** Only same-site paths are followed after sign-in (no open redirects). */
export function safeReturnUrl(candidate: string | null | undefined): string | null {
  if (!candidate || !candidate.startsWith('/') || candidate.startsWith('//')) return null;
  if (candidate.startsWith('/sign-in') || candidate.startsWith('/register')) return null;
  return candidate;
}
