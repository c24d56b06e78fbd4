import { sql, eq } from 'drizzle-orm';
import type { Store, Options, ClientRateLimitInfo } from 'express-rate-limit';
import type { Db } from '../../db/client';
import { rateLimitHits } from './auth.tables';

/** An express-rate-limit store in PostgreSQL, so every app process counts the same attempts. */
export class PgRateLimitStore implements Store {
  private windowMs = 60_000;
  constructor(
    private readonly db: Db,
    readonly prefix: string,
  ) {}

  init(options: Options) {
    this.windowMs = options.windowMs;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const k = this.prefix + key;
    const reset = new Date(Date.now() + this.windowMs);
    const { rows } = await this.db.execute<{ hits: number; reset_at: Date }>(sql`
      insert into rate_limit_hits (key, hits, reset_at) values (${k}, 1, ${reset})
      on conflict (key) do update set
        hits = case when rate_limit_hits.reset_at <= now() then 1 else rate_limit_hits.hits + 1 end,
        reset_at = case when rate_limit_hits.reset_at <= now() then excluded.reset_at else rate_limit_hits.reset_at end
      returning hits, reset_at`);
    const row = rows[0]!;
    return { totalHits: Number(row.hits), resetTime: new Date(row.reset_at) };
  }

  async decrement(key: string) {
    await this.db.execute(sql`update rate_limit_hits set hits = greatest(hits - 1, 0) where key = ${this.prefix + key}`);
  }

  async resetKey(key: string) {
    await this.db.delete(rateLimitHits).where(eq(rateLimitHits.key, this.prefix + key));
  }
}
