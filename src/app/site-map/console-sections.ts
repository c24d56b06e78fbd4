import type { Role } from '@shared/schemas/auth';
import { hasAnyRole } from '@/lib/roles';
import type { ConsoleSection } from './types';

// The staff console, one section per role. A section without `lazy` shows a landing page built from its
// text; the issue that builds the section adds `lazy` (and `children` for its sub-pages).
export const consoleSections: ConsoleSection[] = [
  {
    id: 'orbit',
    path: 'orbit',
    title: 'Orbit desk',
    roles: ['engineer', 'admin'],
    summary: 'Element sets for Tern-1, sailing periods and what the sail is doing to the orbit.',
    duties: [
      'Load TLE and OMM element sets and keep the history of each object in one place.',
      'Mark sailing periods — raising, edge-on, tumbling or unknown — and measure sail yield across them.',
      'Watch apogee, perigee and B* over time, and estimate the crossover altitude where sailing beats drag.',
      'Freeze a chart as a snapshot that outreach can embed in a dispatch.',
    ],
    lazy: () => import('@/app/routes/console/orbit/trend'),
    children: [
      { path: 'upload', lazy: () => import('@/app/routes/console/orbit/upload') },
      { path: 'history', lazy: () => import('@/app/routes/console/orbit/history') },
      { path: 'sailing-periods', lazy: () => import('@/app/routes/console/orbit/sailing-periods') },
      { path: 'snapshots', lazy: () => import('@/app/routes/console/orbit/snapshots') },
      { path: 'snapshots/:snapshotId', lazy: () => import('@/app/routes/console/orbit/snapshot') },
      { path: 'spacecraft', lazy: () => import('@/app/routes/console/orbit/spacecraft') },
    ],
  },
  {
    id: 'dispatches',
    path: 'dispatches',
    title: 'Dispatch desk',
    roles: ['outreach', 'admin'],
    summary: 'Mission updates for backers and the public, from draft to published.',
    duties: [
      'Write dispatches and move them from draft to scheduled to published, or withdraw one.',
      'Choose each dispatch’s audience: everyone, backers, chosen tiers or crew members.',
      'Embed snapshots from the orbit desk so backers see what the sail is doing.',
    ],
    lazy: () => import('@/app/routes/console/dispatches/list'),
    children: [{ path: ':id', lazy: () => import('@/app/routes/console/dispatches/edit') }],
  },
  {
    id: 'snapshot-gallery',
    path: 'snapshot-gallery',
    title: 'Snapshot gallery',
    roles: ['outreach', 'admin'],
    summary: 'Every chart the orbit desk has frozen, to pick from when writing a dispatch.',
    duties: ['Browse snapshots by craft, open one, copy its public link or image link for a dispatch.'],
    lazy: () => import('@/app/routes/console/snapshot-gallery'),
  },
  {
    id: 'campaign',
    path: 'campaign',
    title: 'Campaign desk',
    roles: ['outreach', 'admin'],
    summary: 'The campaign’s goal, dates, story, reward tiers and stretch targets.',
    duties: [
      'Edit the campaign page: goal, dates and story.',
      'Add, change or hide reward tiers and crew memberships.',
      'Set the stretch targets.',
    ],
    lazy: () => import('@/app/routes/console/campaign'),
  },
  {
    id: 'books',
    path: 'books',
    title: 'Books',
    roles: ['finance', 'admin'],
    summary: 'The ledger of every money movement, refunds, payouts and reconciliation.',
    duties: [
      'Read the ledger: charges, refunds, disputes, fees and payouts, in minor units with their currency.',
      'Issue refunds and follow disputes through to their outcome.',
      'Start a reconciliation run against the processor’s records and work through its findings.',
      'Close the month once the ledger and the processor agree.',
    ],
    lazy: () => import('@/app/routes/console/books/overview'),
    children: [
      { path: 'reconcile', lazy: () => import('@/app/routes/console/books/reconcile') },
      { path: 'pledges', lazy: () => import('@/app/routes/console/books/pledges') },
      { path: 'pledges/:pledgeId', lazy: () => import('@/app/routes/console/books/pledge') },
      { path: 'disputes', lazy: () => import('@/app/routes/console/books/disputes') },
      { path: 'months', lazy: () => import('@/app/routes/console/books/months') },
      { path: 'months/:month', lazy: () => import('@/app/routes/console/books/month') },
    ],
  },
  {
    id: 'people',
    path: 'people',
    title: 'People',
    roles: ['admin'],
    summary: 'Accounts, their roles, the audit log of every change, and the mail queue.',
    duties: ['Find accounts, grant and revoke roles, and read the audit log.', 'Watch the mail queue: waiting, sent and failed messages.'],
    lazy: () => import('@/app/routes/console/people'),
    children: [{ path: 'mail-queue', lazy: () => import('@/app/routes/console/people-mail-queue') }],
  },
];

export function sectionsFor(roles: readonly Role[]): ConsoleSection[] {
  return consoleSections.filter((section) => hasAnyRole(roles, section.roles));
}
