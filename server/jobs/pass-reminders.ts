import { z } from 'zod';
import { and, eq, gt, lt, sql } from 'drizzle-orm';
import { twoline2satrec } from 'satellite.js';
import { defineQueue, type JobContext } from './queue';
import { findVisiblePasses, type VisiblePass } from '../../shared/orbit/passes';
import { GOOD_PASS_MIN_ELEVATION_DEG } from '../../shared/schemas/places';
import { savedPlaces, passReminders } from '../modules/places/places.tables';
import { accounts, emailPreferences } from '../modules/accounts/accounts.tables';
import { queueMail } from '../modules/mail/mail-queue';
import { signUnsubscribeToken } from '../modules/my-support/unsubscribe';
import { listUnsubscribeHeaders } from '../modules/dispatches/dispatch-sending';

const HOUR_MS = 3_600_000;
/** How far ahead a run looks. Runs are hourly, so each pass is seen by about 24 runs: the key makes that one e-mail. */
export const REMINDER_LOOKAHEAD_MS = 24 * HOUR_MS;
/** A newer element set moves a pass by seconds to minutes; two passes over one place are at least ~90 min apart. */
const SAME_PASS_WITHIN_MS = 20 * 60_000;
/** Past this age an element set predicts passes too poorly to e-mail anyone about them. */
const MAX_SET_AGE_MS = 14 * 24 * HOUR_MS;

export const passRemindersQueue = defineQueue({
  name: 'pass-reminders',
  // `atMs` pins "now" (tests, a replay); the schedule leaves it out.
  schema: z.object({ atMs: z.number().int().positive().optional() }),
  options: { retryLimit: 2, retryDelay: 120, expireInSeconds: 900, policy: 'singleton' },
  schedule: { cron: '41 * * * *', data: {} },
  handler: async ({ atMs }, { ctx }) => runPassReminders(ctx, atMs ?? Date.now()),
});

export type PassRemindersResult = { places: number; passes: number; queued: number; skipped?: string };

const passKeyOf = (placeId: string, pass: VisiblePass) =>
  `${placeId}/${new Date(Math.floor(pass.highest.atMs / 60_000) * 60_000).toISOString().slice(0, 16)}`;

/**
 * For each saved place whose owner turned reminders on: the mission craft's good passes (visible, and at least
 * GOOD_PASS_MIN_ELEVATION_DEG high) starting in the next 24 h, one reminder e-mail per pass through the mail queue.
 */
export async function runPassReminders(ctx: Pick<JobContext, 'db' | 'config' | 'logger'>, nowMs: number): Promise<PassRemindersResult> {
  const { db, config } = ctx;
  const [set] = await db
    .execute<{ name: string; line1: string; line2: string; epoch_ms: number }>(
      sql`
    select s.name, e.line1, e.line2, e.epoch_ms from spacecraft s
      join lateral (select line1, line2, epoch_ms from element_sets
                     where spacecraft_id = s.id and not outlier order by epoch_ms desc limit 1) e on true
     where s.is_mission_craft`,
    )
    .then((r) => r.rows);
  if (!set) return { places: 0, passes: 0, queued: 0, skipped: 'no element set for the mission craft' };
  if (nowMs - Number(set.epoch_ms) > MAX_SET_AGE_MS) {
    return { places: 0, passes: 0, queued: 0, skipped: 'the newest element set is too old to predict passes' };
  }
  const satrec = twoline2satrec(set.line1, set.line2);

  const places = await db
    .select({
      id: savedPlaces.id,
      name: savedPlaces.name,
      latitudeDeg: savedPlaces.latitudeDeg,
      longitudeDeg: savedPlaces.longitudeDeg,
      timeZone: savedPlaces.timeZone,
      accountId: accounts.id,
      email: accounts.email,
      displayName: accounts.displayName,
    })
    .from(savedPlaces)
    .innerJoin(accounts, eq(accounts.id, savedPlaces.accountId))
    .innerJoin(emailPreferences, eq(emailPreferences.accountId, accounts.id))
    .where(and(eq(emailPreferences.passReminders, true), sql`${accounts.deletedAt} is null`, sql`${accounts.emailVerifiedAt} is not null`));

  const result: PassRemindersResult = { places: places.length, passes: 0, queued: 0 };
  for (const place of places) {
    const passes = findVisiblePasses({
      satrec,
      observer: { latitudeDeg: place.latitudeDeg, longitudeDeg: place.longitudeDeg },
      fromMs: nowMs,
      toMs: nowMs + REMINDER_LOOKAHEAD_MS,
    }).filter((p) => p.highest.elevationDeg >= GOOD_PASS_MIN_ELEVATION_DEG && p.start.atMs > nowMs);
    result.passes += passes.length;
    for (const pass of passes) {
      const passKey = passKeyOf(place.id, pass);
      const queued = await db.transaction(async (tx) => {
        // The place's row lock orders two workers on one place; a deleted place (or account) ends here.
        const [locked] = await tx.select({ id: savedPlaces.id }).from(savedPlaces).where(eq(savedPlaces.id, place.id)).for('update');
        if (!locked) return false;
        const [near] = await tx
          .select({ id: passReminders.id })
          .from(passReminders)
          .where(
            and(
              eq(passReminders.placeId, place.id),
              gt(passReminders.highestAt, new Date(pass.highest.atMs - SAME_PASS_WITHIN_MS)),
              lt(passReminders.highestAt, new Date(pass.highest.atMs + SAME_PASS_WITHIN_MS)),
            ),
          );
        if (near) return false;
        const inserted = await tx
          .insert(passReminders)
          .values({ placeId: place.id, passKey, highestAt: new Date(pass.highest.atMs), maxElevationDeg: pass.highest.elevationDeg })
          .onConflictDoNothing({ target: passReminders.passKey })
          .returning({ id: passReminders.id });
        if (inserted.length === 0) return false;
        const token = signUnsubscribeToken(config.SESSION_SECRET, place.accountId, 'passReminders');
        const point = (p: VisiblePass['start']) => ({
          at: new Date(p.atMs).toISOString(),
          elevationDeg: p.elevationDeg,
          compass: p.compass,
        });
        return queueMail(tx, {
          template: 'pass-reminder',
          to: place.email,
          accountId: place.accountId,
          category: 'transactional',
          idempotencyKey: `pass-reminder/${passKey}`,
          headers: listUnsubscribeHeaders(`${config.PUBLIC_URL}/api/email-choices/unsubscribe?token=${token}`),
          data: {
            displayName: place.displayName,
            craftName: set.name,
            placeName: place.name,
            timeZone: place.timeZone,
            start: point(pass.start),
            highest: point(pass.highest),
            end: point(pass.end),
            skyWatchUrl: `${config.PUBLIC_URL}/sky-watch?lat=${place.latitudeDeg}&lon=${place.longitudeDeg}`,
            unsubscribeUrl: `${config.PUBLIC_URL}/unsubscribe?token=${token}`,
            choicesUrl: `${config.PUBLIC_URL}/my-support/email`,
          },
        });
      });
      if (queued) result.queued++;
    }
  }
  ctx.logger.info(result, 'pass reminders');
  return result;
}
