import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * Ends every stored session signed in to the account except `keepSessionId` (the browser making the change).
 * passport keeps the account id at sess.passport.user in connect-pg-simple's `session` table.
 */
export async function endOtherSessions(db: Db | Tx, { accountId, keepSessionId }: { accountId: string; keepSessionId?: string }) {
  const { rowCount } = await db.execute(sql`
    delete from session
    where sess -> 'passport' ->> 'user' = ${accountId}
      and sid <> ${keepSessionId ?? ''}`);
  return rowCount ?? 0;
}
