import { describe, expect, it } from 'vitest';
import { actionInWords, auditActionWords, changesInWords, entryInWords } from '../../src/features/admin/audit-words';
import { fromLocalInput, toLocalInput } from '../../src/features/campaign/format';

const entry = (over: Record<string, unknown>) => ({
  id: 1,
  at: '2026-03-01T10:00:00.000Z',
  actor: { id: 'a', email: 'outreach@saltmarsh.example' },
  action: 'tier.updated',
  subjectType: 'tier',
  subjectId: '7c0e',
  before: null,
  after: null,
  ...over,
});

describe('the audit log in words', () => {
  it('says who did what to which record, not the action code', () => {
    const e = entry({
      before: { title: 'Dish visit', minAmountMinor: 40000 },
      after: { title: 'Dish visit and tea', minAmountMinor: 45000 },
    });
    expect(entryInWords(e)).toBe('outreach@saltmarsh.example changed the tier Dish visit and tea');
    expect(entryInWords(entry({ action: 'role.granted', subjectType: 'account' }), 'backer@saltmarsh.example')).toBe(
      'outreach@saltmarsh.example gave a role to backer@saltmarsh.example',
    );
    expect(entryInWords(entry({ actor: null, action: 'snapshot.deleted', before: { title: 'First raising' } }))).toBe(
      'The system deleted the snapshot First raising',
    );
  });

  it('names each changed field with old → new in words', () => {
    expect(
      changesInWords({
        before: { minAmountMinor: 40000, startsAt: '2026-01-05T09:15:42.000Z', isPublic: false },
        after: { minAmountMinor: 45000, startsAt: '2026-01-06T09:15:00.000Z', isPublic: true },
      }),
    ).toEqual([
      { field: 'minimum amount (minor units)', before: '40000', after: '45000' },
      { field: 'opens', before: '2026-01-05 09:15:42 UTC', after: '2026-01-06 09:15 UTC' },
      { field: 'public', before: 'no', after: 'yes' },
    ]);
    expect(changesInWords({ before: { roles: ['backer'] }, after: { roles: ['backer', 'outreach'] } })).toEqual([
      { field: 'roles', before: 'backer', after: 'backer, outreach' },
    ]);
  });

  it('has a sentence for every action the server records', () => {
    for (const code of ['campaign.updated', 'tier.updated', 'snapshot.updated', 'role.granted', 'sailing_period.deleted'])
      expect(auditActionWords[code], code).toBeTruthy();
    expect(actionInWords('payout.noted')).toBe('payout noted');
  });
});

describe('the campaign form times', () => {
  it('sends a time the user did not touch back with its seconds, and a changed one at the minute', () => {
    const stored = '2026-01-05T09:15:42.000Z';
    expect(fromLocalInput(toLocalInput(stored), stored)).toBe(stored);
    expect(fromLocalInput('2026-01-05T09:20', stored)).toBe('2026-01-05T09:20:00Z');
  });
});
