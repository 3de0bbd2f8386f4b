import { signal } from '@angular/core';
import type { Membership, User } from '../api-types';
import { homeUrl, safeReturnUrl } from './auth-guards';

function person(user: Partial<User> | null, team: Membership | null) {
  const base: User = { id: 'u1', email: 'dana@example.test', displayName: 'Dana', displayUnits: 'si' };
  return { user: signal(user ? { ...base, ...user } : null), currentTeam: signal(team) };
}

const TEAM: Membership = { teamId: 't-42', teamName: 'Harrow Vale Racing', teamSlug: 'harrow-vale', roles: ['engineer'] };

describe('homeUrl (landing by role)', () => {
  it('lands an instructor on the programmes, even when they are also in a team', () => {
    expect(homeUrl(person({ instructor: true }, TEAM))).toBe('/programmes');
    expect(homeUrl(person({ instructor: true }, null))).toBe('/programmes');
  });

  it('lands anyone else on the team they last worked in', () => {
    expect(homeUrl(person({ instructor: false }, TEAM))).toBe('/teams/t-42');
    expect(homeUrl(person({}, { ...TEAM, teamId: 'a/b' }))).toBe('/teams/a%2Fb');
  });

  it('lands a person without a team on the team list', () => {
    expect(homeUrl(person({}, null))).toBe('/teams');
  });
});

describe('safeReturnUrl', () => {
  it('follows same-site paths only', () => {
    expect(safeReturnUrl('/teams/t-42')).toBe('/teams/t-42');
    expect(safeReturnUrl('//evil.example/x')).toBeNull();
    expect(safeReturnUrl('https://evil.example')).toBeNull();
    expect(safeReturnUrl('/sign-in')).toBeNull();
  });
});
