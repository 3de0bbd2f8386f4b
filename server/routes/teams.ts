/** /api/teams: teams and their members (who join only by accepting an invitation: routes/invitations.ts). */
import { Router } from 'express';
import { z } from 'zod';
import { validate } from '../http/errors.js';
import { notFound } from '../../shared/errors.js';
import { currentAccess, currentUser, isUuid, type Authorizer } from '../http/authorize.js';
import { ROLES } from '../permissions.js';
import type { Teams } from '../services/teams.js';
import { reply } from '../http/reply.js';
import type { TeamDetail, TeamMember, TeamSummary } from '../../shared/api/teams.js';

const teamName = z.string().trim().min(1, 'is required').max(120);
const slug = z
  .string()
  .trim()
  .min(2, 'must be at least 2 characters')
  .max(60)
  .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, 'use lower-case letters, digits and single hyphens');
const roles = z
  .array(z.enum(ROLES))
  .min(1, 'give at least one role')
  .transform((r) => ROLES.filter((x) => r.includes(x)));

const createTeamSchema = z.strictObject({ name: teamName, slug });
const renameTeamSchema = z.strictObject({ name: teamName });
const changeRolesSchema = z.strictObject({ roles });

function memberId(raw: unknown): string {
  if (!isUuid(raw)) throw notFound('Member');
  return raw;
}

export function teamsRouter(teams: Teams, auth: Authorizer): Router {
  const r = Router();
  const { requireUser, requirePermission } = auth;

  r.get('/', requireUser, async (req, res) => {
    reply<TeamSummary[]>(res, await teams.listFor(currentUser(req).id));
  });

  r.post('/', requireUser, async (req, res) => {
    reply<TeamSummary>(res, await teams.create(currentUser(req).id, validate(createTeamSchema, req.body)), 201);
  });

  r.get('/:teamId', requirePermission('team:read'), async (req, res) => {
    const a = currentAccess(req);
    reply<TeamDetail>(res, await teams.detail(a.teamId, a.roles));
  });

  r.patch('/:teamId', requirePermission('members:manage'), async (req, res) => {
    const a = currentAccess(req);
    reply<TeamDetail>(res, await teams.rename(a.teamId, validate(renameTeamSchema, req.body).name, a.roles));
  });

  r.delete('/:teamId', requirePermission('members:manage'), async (req, res) => {
    await teams.remove(currentAccess(req).teamId);
    res.status(204).end();
  });

  r.get('/:teamId/members', requirePermission('team:read'), async (req, res) => {
    reply<TeamMember[]>(res, await teams.members(currentAccess(req).teamId));
  });

  // Nobody is added directly: people join by accepting an invitation (routes/invitations.ts).

  r.patch('/:teamId/members/:userId', requirePermission('members:manage'), async (req, res) => {
    const input = validate(changeRolesSchema, req.body);
    reply<TeamMember | null>(res, await teams.changeMember(currentAccess(req).teamId, memberId(req.params['userId']), input.roles, currentUser(req).id));
  });

  // Any member may leave a team (the last owner may not).
  r.delete('/:teamId/membership', requirePermission('team:read'), async (req, res) => {
    await teams.changeMember(currentAccess(req).teamId, currentUser(req).id, null, currentUser(req).id);
    res.status(204).end();
  });

  r.delete('/:teamId/members/:userId', requirePermission('members:manage'), async (req, res) => {
    await teams.changeMember(currentAccess(req).teamId, memberId(req.params['userId']), null, currentUser(req).id);
    res.status(204).end();
  });

  return r;
}
