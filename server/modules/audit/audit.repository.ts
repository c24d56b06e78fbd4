import { desc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { auditLog } from './audit.tables';
import { accounts } from '../accounts/accounts.tables';
import { diffFields } from './audit-diff';

export type AuditEntryInput = {
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId?: string | null;
  before?: unknown;
  after?: unknown;
};

type Tx = Pick<Db, 'insert'>;

export async function recordAudit(tx: Tx, entry: AuditEntryInput) {
  await tx.insert(auditLog).values({
    actorId: entry.actorId,
    action: entry.action,
    subjectType: entry.subjectType,
    subjectId: entry.subjectId ?? null,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}

/**
 * An audited change of a record: writes exactly the fields of `after` whose value differs from `before`,
 * old and new; writes nothing (and answers false) when nothing changed.
 */
export async function recordChange(
  tx: Tx,
  entry: Omit<AuditEntryInput, 'before' | 'after'> & { before: Record<string, unknown>; after: Record<string, unknown> },
): Promise<boolean> {
  const diff = diffFields(entry.before, entry.after);
  if (!diff) return false;
  await recordAudit(tx, { ...entry, before: diff.before, after: diff.after });
  return true;
}

export async function listAudit(db: Db, limit: number) {
  const rows = await db
    .select({
      id: auditLog.id,
      at: auditLog.at,
      action: auditLog.action,
      subjectType: auditLog.subjectType,
      subjectId: auditLog.subjectId,
      before: auditLog.before,
      after: auditLog.after,
      actorId: auditLog.actorId,
      actorEmail: accounts.email,
    })
    .from(auditLog)
    .leftJoin(accounts, eq(accounts.id, auditLog.actorId))
    .orderBy(desc(auditLog.id))
    .limit(limit);
  return rows.map((r) => ({
    id: r.id,
    at: r.at.toISOString(),
    actor: r.actorId ? { id: r.actorId, email: r.actorEmail ?? '' } : null,
    action: r.action,
    subjectType: r.subjectType,
    subjectId: r.subjectId,
    before: r.before,
    after: r.after,
  }));
}
