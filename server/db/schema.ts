/**
 * The data model. Engineering documents (vehicle data, corner geometry) are
 * validated JSON carrying their own `formatVersion`; every edit is kept as an
 * immutable revision row, and the parent row holds the current revision.
 */
import { sql } from 'drizzle-orm';
import {
  pgTable,
  uuid,
  text,
  boolean,
  integer,
  jsonb,
  json,
  timestamp,
  varchar,
  doublePrecision,
  index,
  uniqueIndex,
  primaryKey,
  check,
  customType,
} from 'drizzle-orm/pg-core';
import { AXLE_NAMES } from '../../shared/schema/axle.js';
import type { ConfigurationResults, FrozenInputs } from '../../shared/api/configurations.js';
import type { TrackProfileId } from '../../shared/tracks/profiles.js';
import type { RigMapping, RigPoint } from '../../shared/io/rig-measurement.js';
import type { Role } from '../permissions.js';
import type { Board } from '../../shared/api/programmes.js';
import type { StudyError, StudyResolvedTarget } from '../../shared/api/studies.js';
import type { StudyRequest, StudySpec } from '../../shared/study/schema.js';
import type { StudyChunkResult, StudyResult } from '../../shared/study/run.js';
import type { ErrorBody } from '../http/errors.js';

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** Stored lower-cased; unique. */
    email: text('email').notNull(),
    displayName: text('display_name').notNull(),
    passwordHash: text('password_hash').notNull(),
    displayUnits: text('display_units', { enum: ['si', 'imperial'] }).notNull().default('si'),
    /** Instructors run cross-team programmes; it is not a team role. */
    instructor: boolean('instructor').notNull().default(false),
    /** When the address was confirmed through the verification mail; null until then. */
    emailVerifiedAt: timestamp('email_verified_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_unique').on(t.email)],
);

export const teams = pgTable(
  'teams',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull(),
    slug: text('slug').notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('teams_slug_unique').on(t.slug)],
);

export const memberships = pgTable(
  'memberships',
  {
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** A set of roles: owner, engineer, designer, reviewer, viewer. */
    roles: text('roles').array().$type<Role[]>().notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.teamId, t.userId] }),
    index('memberships_user_idx').on(t.userId),
    check('memberships_roles_not_empty', sql`cardinality(${t.roles}) > 0`),
  ],
);

export const vehicles = pgTable(
  'vehicles',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    archived: boolean('archived').notNull().default(false),
    /** Current revision number (1 = created). */
    revision: integer('revision').notNull().default(1),
    /** Vehicle document of the balance model (shared/schema/vehicle.ts), or null until entered. */
    data: jsonb('data'),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('vehicles_team_idx').on(t.teamId)],
);

/** Immutable snapshot of a vehicle at each revision. */
export const vehicleRevisions = pgTable(
  'vehicle_revisions',
  {
    vehicleId: uuid('vehicle_id')
      .notNull()
      .references(() => vehicles.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    name: text('name').notNull(),
    archived: boolean('archived').notNull(),
    data: jsonb('data'),
    message: text('message'),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.vehicleId, t.revision] })],
);

export const DESIGN_STATUSES = ['draft', 'proposed', 'accepted', 'approved', 'changes_requested'] as const;
export type DesignStatus = (typeof DESIGN_STATUSES)[number];

export const axleDesigns = pgTable(
  'axle_designs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    vehicleId: uuid('vehicle_id')
      .notNull()
      .references(() => vehicles.id, { onDelete: 'cascade' }),
    axle: text('axle', { enum: AXLE_NAMES }).notNull(),
    name: text('name').notNull(),
    status: text('status', { enum: DESIGN_STATUSES }).notNull().default('draft'),
    archived: boolean('archived').notNull().default(false),
    revision: integer('revision').notNull().default(1),
    /** Corner document (shared/schema/corner.ts). */
    corner: jsonb('corner').notNull(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('axle_designs_vehicle_idx').on(t.vehicleId)],
);

/** Immutable snapshot of an axle design at each revision. */
export const axleDesignRevisions = pgTable(
  'axle_design_revisions',
  {
    designId: uuid('design_id')
      .notNull()
      .references(() => axleDesigns.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    name: text('name').notNull(),
    status: text('status', { enum: DESIGN_STATUSES }).notNull(),
    archived: boolean('archived').notNull(),
    corner: jsonb('corner').notNull(),
    message: text('message'),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.designId, t.revision] })],
);

export const PROPOSAL_STATUSES = ['open', 'accepted', 'rejected', 'withdrawn'] as const;
export type ProposalStatus = (typeof PROPOSAL_STATUSES)[number];

/**
 * Geometry proposed for an axle design (e.g. an intent solution applied by an
 * engineer). It never touches the design until a designer accepts it; then
 * it becomes a new revision of the design.
 */
export const axleDesignProposals = pgTable(
  'axle_design_proposals',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    designId: uuid('design_id')
      .notNull()
      .references(() => axleDesigns.id, { onDelete: 'cascade' }),
    /** The design revision the proposal was made on. */
    baseRevision: integer('base_revision').notNull(),
    corner: jsonb('corner').notNull(),
    message: text('message'),
    /** What produced it (e.g. the intent and the solve summary), kept for the reviewer. */
    origin: jsonb('origin').$type<Record<string, unknown>>(),
    status: text('status', { enum: PROPOSAL_STATUSES }).notNull().default('open'),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    decidedBy: uuid('decided_by').references(() => users.id, { onDelete: 'set null' }),
    decidedAt: timestamp('decided_at', { withTimezone: true }),
    decisionMessage: text('decision_message'),
    /** The design revision created by accepting it. */
    acceptedRevision: integer('accepted_revision'),
  },
  (t) => [index('axle_design_proposals_design_idx').on(t.designId)],
);

/**
 * Sessions of connect-pg-simple (its documented table layout). Created here
 * so the migration owns it; the store never creates tables itself.
 */
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);

export const CONFIGURATION_STATUSES = ['draft', 'in_review', 'approved', 'changes_requested', 'released', 'validated'] as const;
export type ConfigurationStatus = (typeof CONFIGURATION_STATUSES)[number];

/**
 * A configuration: what a balance figure depends on (one vehicle revision,
 * one front and one rear axle design revision, a track profile). It is the
 * unit of review. Every change of its references is a new immutable
 * revision and returns it to `draft`. References use NO ACTION, so a
 * vehicle or design a configuration points at can never be deleted on its
 * own (only with its whole team).
 */
export const configurations = pgTable(
  'configurations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    status: text('status', { enum: CONFIGURATION_STATUSES }).notNull().default('draft'),
    revision: integer('revision').notNull().default(1),
    vehicleId: uuid('vehicle_id')
      .notNull()
      .references(() => vehicles.id),
    vehicleRevision: integer('vehicle_revision').notNull(),
    frontDesignId: uuid('front_design_id')
      .notNull()
      .references(() => axleDesigns.id),
    frontDesignRevision: integer('front_design_revision').notNull(),
    rearDesignId: uuid('rear_design_id')
      .notNull()
      .references(() => axleDesigns.id),
    rearDesignRevision: integer('rear_design_revision').notNull(),
    /** Track profile id of the intent engine (shared/tracks/profiles.ts). */
    trackProfile: text('track_profile').$type<TrackProfileId>().notNull(),
    archived: boolean('archived').notNull().default(false),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('configurations_team_idx').on(t.teamId)],
);

/** Immutable snapshot of a configuration's references at each revision. */
export const configurationRevisions = pgTable(
  'configuration_revisions',
  {
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    name: text('name').notNull(),
    vehicleId: uuid('vehicle_id').notNull(),
    vehicleRevision: integer('vehicle_revision').notNull(),
    frontDesignId: uuid('front_design_id').notNull(),
    frontDesignRevision: integer('front_design_revision').notNull(),
    rearDesignId: uuid('rear_design_id').notNull(),
    rearDesignRevision: integer('rear_design_revision').notNull(),
    trackProfile: text('track_profile').$type<TrackProfileId>().notNull(),
    message: text('message'),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.configurationId, t.revision] })],
);

/** Every status change of a configuration, with who made it and why. */
export const configurationTransitions = pgTable(
  'configuration_transitions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    fromStatus: text('from_status', { enum: CONFIGURATION_STATUSES }).notNull(),
    toStatus: text('to_status', { enum: CONFIGURATION_STATUSES }).notNull(),
    message: text('message'),
    actorId: uuid('actor_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('configuration_transitions_configuration_idx').on(t.configurationId)],
);

/**
 * What an approval froze: the inputs (documents), the computed results and
 * the engine version that computed them. Never updated.
 */
export const configurationApprovals = pgTable(
  'configuration_approvals',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    engineVersion: text('engine_version').notNull(),
    inputs: jsonb('inputs').$type<FrozenInputs>().notNull(),
    results: jsonb('results').$type<ConfigurationResults>().notNull(),
    message: text('message'),
    approvedBy: uuid('approved_by').references(() => users.id, { onDelete: 'set null' }),
    approvedAt: timestamp('approved_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('configuration_approvals_configuration_idx').on(t.configurationId)],
);

/**
 * Review comments in threads (a reply has a parent). A comment may point at
 * a result by a reference key (`budget`, `chart:steer-curve`,
 * `caution:bump-toe-change`…); a thread is resolved on its first comment.
 */
export const reviewComments = pgTable(
  'review_comments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    /** The configuration revision the comment was written on. */
    revision: integer('revision').notNull(),
    parentId: uuid('parent_id'),
    resultRef: text('result_ref'),
    body: text('body').notNull(),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    resolvedBy: uuid('resolved_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [index('review_comments_configuration_idx').on(t.configurationId)],
);

export const MAIL_STATUSES = ['pending', 'sent', 'failed'] as const;

/**
 * Outgoing mail, written in the same transaction as the action that causes
 * it and sent by the mail worker (server/mail/outbox.ts), so no action is
 * lost while the mail server is down. `dedupeKey` makes enqueueing
 * idempotent; the Message-ID derives from the row id, so a resend after a
 * crash is recognisable as the same message.
 */
export const mailOutbox = pgTable(
  'mail_outbox',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: text('kind').notNull(),
    teamId: uuid('team_id').references(() => teams.id, { onDelete: 'set null' }),
    toAddress: text('to_address').notNull(),
    subject: text('subject').notNull(),
    textBody: text('text_body').notNull(),
    dedupeKey: text('dedupe_key'),
    status: text('status', { enum: MAIL_STATUSES }).notNull().default('pending'),
    attempts: integer('attempts').notNull().default(0),
    nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
    lastError: text('last_error'),
    sentAt: timestamp('sent_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('mail_outbox_dedupe_unique').on(t.dedupeKey), index('mail_outbox_due_idx').on(t.status, t.nextAttemptAt)],
);

/** What the development fake SMTP server received (never used in production). */
export const capturedMail = pgTable(
  'captured_mail',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    messageId: text('message_id').notNull(),
    fromAddress: text('from_address').notNull(),
    toAddresses: text('to_addresses').array().notNull(),
    subject: text('subject').notNull(),
    textBody: text('text_body').notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('captured_mail_message_unique').on(t.messageId)],
);

/** An invitation to a team by e-mail, accepted through a signed, expiring link. */
export const teamInvitations = pgTable(
  'team_invitations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    /** Stored lower-cased. */
    email: text('email').notNull(),
    roles: text('roles').array().$type<Role[]>().notNull(),
    invitedBy: uuid('invited_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    acceptedBy: uuid('accepted_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('team_invitations_team_idx').on(t.teamId)],
);

/** Single-use password reset tokens; only a SHA-256 of the token is stored. */
export const passwordResets = pgTable('password_resets', {
  tokenHash: text('token_hash').primaryKey(),
  userId: uuid('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: createdAt(),
});

export const TOKEN_SCOPES = ['read', 'write'] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

/**
 * Personal API tokens for scripts and the command line: bound to one user
 * and one team, read or write. Only a SHA-256 of the token is stored; the
 * token itself is shown once, when created.
 */
export const apiTokens = pgTable(
  'api_tokens',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    scope: text('scope', { enum: TOKEN_SCOPES }).notNull(),
    tokenHash: text('token_hash').notNull(),
    /** The first characters, so a person can tell their tokens apart. */
    prefix: text('prefix').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }),
    lastUsedAt: timestamp('last_used_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('api_tokens_hash_unique').on(t.tokenHash), index('api_tokens_user_idx').on(t.userId)],
);

/**
 * Who changed what, when (UTC), per team; entries about an axle design carry
 * its id so the design's own history can be listed. Written in the same
 * transaction as the change where the change has one. Never updated.
 */
export const activityLog = pgTable(
  'activity_log',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    actorId: uuid('actor_id').references(() => users.id, { onDelete: 'set null' }),
    /** e.g. `vehicle.data`, `design.corner`, `configuration.approve`, `member.add`. */
    action: text('action').notNull(),
    subjectType: text('subject_type').notNull(),
    subjectId: uuid('subject_id'),
    designId: uuid('design_id'),
    summary: text('summary').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('activity_log_team_idx').on(t.teamId, t.at), index('activity_log_design_idx').on(t.designId, t.at)],
);

/** An instructor-led programme comparing teams' configurations on one track profile. */
export const programmes = pgTable('programmes', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  instructorId: uuid('instructor_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  trackProfile: text('track_profile').$type<TrackProfileId>().notNull(),
  createdAt: createdAt(),
});

export const PROGRAMME_TEAM_STATUSES = ['invited', 'accepted', 'declined'] as const;

/** A team's place in a programme; `accepted` grants the instructor read access to the team. */
export const programmeTeams = pgTable(
  'programme_teams',
  {
    programmeId: uuid('programme_id')
      .notNull()
      .references(() => programmes.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    status: text('status', { enum: PROGRAMME_TEAM_STATUSES }).notNull().default('invited'),
    invitedAt: timestamp('invited_at', { withTimezone: true }).notNull().defaultNow(),
    decidedAt: timestamp('decided_at', { withTimezone: true }),
    decidedBy: uuid('decided_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [primaryKey({ columns: [t.programmeId, t.teamId] }), index('programme_teams_team_idx').on(t.teamId)],
);

/** The board as it stood at a moment (e.g. a deadline). Never updated. */
export const programmeSnapshots = pgTable(
  'programme_snapshots',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    programmeId: uuid('programme_id')
      .notNull()
      .references(() => programmes.id, { onDelete: 'cascade' }),
    label: text('label'),
    board: jsonb('board').$type<Board>().notNull(),
    takenBy: uuid('taken_by').references(() => users.id, { onDelete: 'set null' }),
    takenAt: timestamp('taken_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('programme_snapshots_programme_idx').on(t.programmeId)],
);

export const RIG_ATTACHMENTS = ['configuration', 'baseline'] as const;
export const SIDES = ['left', 'right'] as const;
export const RIG_BASES = ['change', 'absolute'] as const;

/**
 * A bump-steer rig measurement (docs/rig-measurements.md): the parsed points
 * in Rollwise's conventions (not only the file), the column mapping, units
 * and signs it was read with, and what it is compared with: a configuration
 * revision's front or rear axle design, or an axle design revision on its
 * own as a baseline of the current car before a change. The design and
 * revision the comparison uses are always stored. Points are never edited;
 * a measurement is only created whole or deleted.
 */
export const rigMeasurements = pgTable(
  'rig_measurements',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    fileName: text('file_name').notNull(),
    attachedTo: text('attached_to', { enum: RIG_ATTACHMENTS }).notNull(),
    configurationId: uuid('configuration_id').references(() => configurations.id, { onDelete: 'cascade' }),
    configurationRevision: integer('configuration_revision'),
    axle: text('axle', { enum: AXLE_NAMES }).notNull(),
    designId: uuid('design_id')
      .notNull()
      .references(() => axleDesigns.id, { onDelete: 'cascade' }),
    designRevision: integer('design_revision').notNull(),
    side: text('side', { enum: SIDES }).notNull().default('left'),
    rackMm: doublePrecision('rack_mm').notNull().default(0),
    basis: text('basis', { enum: RIG_BASES }).notNull().default('change'),
    /** The mapping the file was read with (shared/io/rig-measurement.ts `RigMapping`). */
    mapping: jsonb('mapping').$type<RigMapping>().notNull(),
    /** Parsed points: `{ travelMm, toeDeg, camberDeg, line }[]`, mm and deg, Rollwise signs. */
    points: jsonb('points').$type<RigPoint[]>().notNull(),
    pointCount: integer('point_count').notNull(),
    hasCamber: boolean('has_camber').notNull(),
    note: text('note'),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    index('rig_measurements_team_idx').on(t.teamId, t.createdAt),
    index('rig_measurements_configuration_idx').on(t.configurationId),
    index('rig_measurements_design_idx').on(t.designId),
    check(
      'rig_measurements_attachment',
      sql`(${t.attachedTo} = 'configuration' AND ${t.configurationId} IS NOT NULL AND ${t.configurationRevision} IS NOT NULL) OR (${t.attachedTo} = 'baseline' AND ${t.configurationId} IS NULL)`,
    ),
  ],
);

/** A team's rig tolerance: the largest |measured − predicted| before a caution, deg. No row: the product defaults. */
export const teamRigSettings = pgTable('team_rig_settings', {
  teamId: uuid('team_id')
    .primaryKey()
    .references(() => teams.id, { onDelete: 'cascade' }),
  toeToleranceDeg: doublePrecision('toe_tolerance_deg').notNull(),
  camberToleranceDeg: doublePrecision('camber_tolerance_deg').notNull(),
  updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

export const COMPUTE_JOB_STATES = ['queued', 'running', 'succeeded', 'failed', 'cancelled'] as const;
export type ComputeJobState = (typeof COMPUTE_JOB_STATES)[number];

/**
 * A background solve job: what its owner polls. The work itself travels on
 * the pg-boss queue (same id); a worker process writes progress and the
 * result here. `goneReason` is set when the result was dropped after its
 * retention time or the queue lost the job; the row stays as a tombstone so
 * the id answers 410 with the reason instead of a 404.
 */
export const computeJobs = pgTable(
  'compute_jobs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    ownerId: uuid('owner_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['solve'] }).notNull(),
    state: text('state', { enum: COMPUTE_JOB_STATES }).notNull().default('queued'),
    progressFraction: doublePrecision('progress_fraction').notNull().default(0),
    progressMessage: text('progress_message').notNull().default('Waiting for a free worker'),
    /** The engine's answer as JSON text (kept as the worker wrote it). */
    resultJson: text('result_json'),
    /** `{ status, code, message, details? }`, as the direct call would have answered. */
    error: jsonb('error').$type<ErrorBody>(),
    goneReason: text('gone_reason', { enum: ['expired', 'lost'] }),
    createdAt: createdAt(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('compute_jobs_owner_idx').on(t.ownerId, t.state), index('compute_jobs_finished_idx').on(t.finishedAt)],
);

export const STUDY_STATUSES = ['queued', 'running', 'completed', 'failed', 'cancelled'] as const;
export type StudyStatus = (typeof STUDY_STATUSES)[number];

/** PostgreSQL `bytea`, as node-postgres gives it (a Buffer). */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

/**
 * A tolerance study or design sweep. `spec` is the fully resolved,
 * self-contained study (shared/study StudySpec) the workers run; it is cut
 * into `totalChunks` chunks, each a pg-boss job. `doneChunks`/`doneSamples`
 * only move when a chunk row is first inserted (study_chunks' key), so a
 * retried chunk is never counted twice.
 */
export const studies = pgTable(
  'studies',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['tolerance', 'sweep'] }).notNull(),
    label: text('label').notNull(),
    status: text('status', { enum: STUDY_STATUSES }).notNull().default('queued'),
    /** What the user asked for (studyRequestSchema), kept for display and re-runs. */
    request: jsonb('request').$type<StudyRequest>().notNull(),
    /** The target with its revision resolved (shared/api/studies.ts). */
    target: jsonb('target').$type<StudyResolvedTarget>().notNull(),
    spec: jsonb('spec').$type<StudySpec>().notNull(),
    seed: integer('seed').notNull(),
    totalChunks: integer('total_chunks').notNull(),
    totalSamples: integer('total_samples').notNull(),
    doneChunks: integer('done_chunks').notNull().default(0),
    doneSamples: integer('done_samples').notNull().default(0),
    /** Summed compute time of the done chunks (for throughput figures). */
    computeMs: doublePrecision('compute_ms').notNull().default(0),
    posesSolved: doublePrecision('poses_solved').notNull().default(0),
    result: jsonb('result').$type<StudyResult>(),
    /**
     * The same result as the API sends it (factors named as the engine names them: withFactorLabels),
     * JSON text made once on the worker's thread at combine time: reading a study splices it into the
     * answer without parsing it (about 100 kB for a tolerance study). Null until completed, and for
     * results stored before migration 0013 until their first read builds it from `result`. Set it to
     * null in a migration when the engine's factor names change: readers rebuild it once.
     */
    resultJson: text('result_json'),
    error: jsonb('error').$type<StudyError>(),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [
    index('studies_team_idx').on(t.teamId, t.createdAt),
    index('studies_active_idx').on(t.teamId, t.status),
    check('studies_progress', sql`${t.doneChunks} >= 0 AND ${t.doneChunks} <= ${t.totalChunks}`),
  ],
);

/**
 * A completed study attached to a configuration's review record (same team):
 * listed with its key figures on the configuration and, the latest per team,
 * on the programme board. Detaching deletes the row.
 */
export const studyAttachments = pgTable(
  'study_attachments',
  {
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    note: text('note').notNull().default(''),
    attachedBy: uuid('attached_by').references(() => users.id, { onDelete: 'set null' }),
    attachedAt: timestamp('attached_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.configurationId] }), index('study_attachments_configuration_idx').on(t.configurationId, t.attachedAt), index('study_attachments_team_idx').on(t.teamId, t.attachedAt)],
);

/** One finished chunk of a study; the key makes a retried chunk land once. */
export const studyChunks = pgTable(
  'study_chunks',
  {
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    chunkIndex: integer('chunk_index').notNull(),
    samples: integer('samples').notNull(),
    poses: doublePrecision('poses').notNull(),
    /**
     * The chunk's counts and failures (shared/study chunkToWire's header) until the study's combined
     * result is stored; then cleared with `outputs`, the row kept for its key, counts and timing.
     * `json`, stored as the worker's text without compression (STORAGE EXTERNAL, migration 0012).
     * A chunk landed before migration 0014 carries its outputs here too, as JSON arrays.
     */
    result: json('result').$type<Omit<StudyChunkResult, 'values'>>(),
    /**
     * The chunk's outputs as little-endian doubles (chunkToWire), until the combined result is stored
     * (a 100 000-sample study's chunks hold about 14 MB). Sent and stored as bytes, uncompressed
     * (STORAGE EXTERNAL, migration 0014): nothing queries inside them, and neither the worker nor
     * PostgreSQL writes or parses them as text.
     */
    outputs: bytea('outputs'),
    computeMs: doublePrecision('compute_ms').notNull(),
    /** Which worker process computed it (host:pid), for operations. */
    worker: text('worker').notNull(),
    finishedAt: timestamp('finished_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.chunkIndex] })],
);

/**
 * A reviewer's written acknowledgement of one Critical caution, given with the
 * sign-off it allowed (the transition to approved). The caution is kept as it
 * read then (message, value, threshold), so the record says what was accepted
 * even after the engine or the thresholds change. Never updated.
 */
export const cautionAcknowledgements = pgTable(
  'caution_acknowledgements',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    transitionId: uuid('transition_id')
      .notNull()
      .references(() => configurationTransitions.id, { onDelete: 'cascade' }),
    axle: text('axle', { enum: AXLE_NAMES }).notNull(),
    code: text('code').notNull(),
    message: text('message').notNull(),
    value: doublePrecision('value'),
    threshold: doublePrecision('threshold'),
    unit: text('unit'),
    reason: text('reason').notNull(),
    acknowledgedBy: uuid('acknowledged_by').references(() => users.id, { onDelete: 'set null' }),
    acknowledgedAt: timestamp('acknowledged_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('caution_acknowledgements_configuration_idx').on(t.configurationId, t.revision)],
);

/**
 * A recorded waiver of the rig evidence for one axle, given with the move to
 * validated that it allowed: the reason says why the configuration counts as
 * validated without a measurement within the team's tolerance. Never updated.
 */
export const rigEvidenceWaivers = pgTable(
  'rig_evidence_waivers',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    configurationId: uuid('configuration_id')
      .notNull()
      .references(() => configurations.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    transitionId: uuid('transition_id')
      .notNull()
      .references(() => configurationTransitions.id, { onDelete: 'cascade' }),
    axle: text('axle', { enum: AXLE_NAMES }).notNull(),
    reason: text('reason').notNull(),
    waivedBy: uuid('waived_by').references(() => users.id, { onDelete: 'set null' }),
    waivedAt: timestamp('waived_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('rig_evidence_waivers_configuration_idx').on(t.configurationId, t.revision)],
);
