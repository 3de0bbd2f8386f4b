/**
 * The review vocabulary of Rollwise in words, for API messages, activity
 * entries and mail: our own, from engineering design reviews (a reviewer
 * signs off a configuration or returns it for rework). The stored status and
 * action codes (`approved`, `request-changes`, …) stay as they are.
 */
import type { ConfigurationStatus } from '../db/schema.js';

export const STATUS_WORDS: Readonly<Record<ConfigurationStatus, string>> = {
  draft: 'draft',
  in_review: 'in review',
  changes_requested: 'returned for rework',
  approved: 'signed off',
  released: 'released to build',
  validated: 'validated',
};

export const ACTION_WORDS = {
  submit: 'submit for review',
  withdraw: 'withdraw from review',
  approve: 'sign off',
  'request-changes': 'return for rework',
  release: 'release to build',
  validate: 'mark validated',
} as const;
