// The audit log in words: each action code as a sentence, each field by its name on screen, each value readable.
import type { AuditEntry } from './api/get-audit';

/** What happened, completed by the record ("changed the campaign Tern-1"). */
export const auditActionWords: Record<string, string> = {
  'account.created': 'created the account',
  'account.deleted': 'deleted the account',
  'account.renamed': 'changed the display name of',
  'identity.linked': 'linked a Google sign-in to',
  'password.reset': 'reset the password of',
  'role.granted': 'gave a role to',
  'role.revoked': 'took a role from',
  'membership.cancel_requested': 'asked to end the crew membership',
  'membership.resumed': 'kept the crew membership',
  'campaign.updated': 'changed the campaign',
  'campaign.stretch_targets_replaced': 'changed the stretch targets of the campaign',
  'tier.created': 'added the tier',
  'tier.updated': 'changed the tier',
  'snapshot.created': 'froze the snapshot',
  'snapshot.updated': 'changed the snapshot',
  'snapshot.deleted': 'deleted the snapshot',
  'spacecraft.created': 'added the spacecraft',
  'spacecraft.updated': 'changed the spacecraft',
  'sailing_period.created': 'added the sailing period',
  'sailing_period.updated': 'changed the sailing period',
  'sailing_period.deleted': 'deleted the sailing period',
  'element_sets.upload_cancelled': 'cancelled the element set upload',
};

const fieldWords: Record<string, string> = {
  title: 'title',
  summary: 'summary',
  story: 'story',
  goalMinor: 'goal (minor units)',
  currency: 'currency',
  startsAt: 'opens',
  endsAt: 'closes',
  caption: 'caption',
  isPublic: 'public',
  minAmountMinor: 'minimum amount (minor units)',
  quantityLimit: 'limit',
  estimatedDelivery: 'estimated delivery',
  position: 'position',
  kind: 'kind',
  active: 'offered',
  description: 'description',
  roles: 'roles',
  targets: 'stretch targets',
  displayName: 'display name',
  startAt: 'from',
  endAt: 'until',
  mode: 'sail mode',
  note: 'note',
  filename: 'file',
};

const humanise = (key: string) =>
  key
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .replace(/_/g, ' ')
    .toLowerCase();

/** "tier.updated" → "changed the tier"; an unknown code still reads as words. */
export const actionInWords = (action: string) => auditActionWords[action] ?? humanise(action.replace('.', ' '));

export const fieldInWords = (key: string) => fieldWords[key] ?? humanise(key);

export function valueInWords(value: unknown): string {
  if (value === undefined || value === null || value === '') return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (Array.isArray(value)) return value.length ? value.map(valueInWords).join(', ') : 'none';
  if (typeof value === 'object') {
    const o = value as Record<string, unknown>;
    if ('title' in o && 'amountMinor' in o) return `${valueInWords(o.title)} at ${valueInWords(o.amountMinor)}`;
    return Object.entries(o)
      .map(([k, v]) => `${fieldInWords(k)} ${valueInWords(v)}`)
      .join('; ');
  }
  if (typeof value === 'string' && /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?Z$/.test(value)) {
    return `${value.slice(0, 10)} ${value.slice(11, 19).replace(/:00$/, '')} UTC`;
  }
  return String(value);
}

/** The fields that changed, each old → new in words; fields of a record created or deleted against nothing. */
export function changesInWords(entry: Pick<AuditEntry, 'before' | 'after'>): { field: string | null; before: string; after: string }[] {
  const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
  const before = entry.before ?? (isRecord(entry.after) ? {} : null);
  const after = entry.after ?? (isRecord(entry.before) ? {} : null);
  if (before === null && after === null) return [];
  if (!isRecord(before) || !isRecord(after)) return [{ field: null, before: valueInWords(before), after: valueInWords(after) }];
  const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])];
  return keys
    .filter((k) => JSON.stringify(before[k] ?? null) !== JSON.stringify(after[k] ?? null))
    .map((k) => ({ field: fieldInWords(k), before: valueInWords(before[k]), after: valueInWords(after[k]) }));
}

/** "outreach@… changed the tier Dish visit": who, what, which record (its name when known, else its id). */
export function entryInWords(entry: AuditEntry, subjectName?: string): string {
  const who = entry.actor?.email ?? 'The system';
  const titled = (v: unknown) =>
    v && typeof v === 'object' && typeof (v as { title?: unknown }).title === 'string' ? (v as { title: string }).title : undefined;
  const which = subjectName ?? titled(entry.after) ?? titled(entry.before) ?? entry.subjectId ?? '';
  return `${who} ${actionInWords(entry.action)} ${which}`.trim();
}
