import type { Seeder } from './seed';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';
import { createSpacecraftRepository } from '../modules/orbit/spacecraft.repository';
import { createOrbitModule } from '../modules/orbit/orbit.routes';

const DAY_MS = 86_400_000;

const PERIOD_NOTES: Record<string, string> = {
  tumbling: 'Attitude not yet controlled; sail rotating slowly.',
  'edge-on': 'Sail feathered edge-on to the flow: drag-only baseline.',
  raising: 'Sail normal along the velocity on the sunlit receding arc.',
  unknown: 'Safe mode after a reaction-wheel reset; attitude not logged.',
};

/** Tern-1's record, a simulated history ingested through the same path as an upload, its sailing log and one public snapshot. */
export const orbitSeeder: Seeder = {
  name: 'orbit desk (Tern-1 history)',
  isSeeded: async (db) => Boolean(await createSpacecraftRepository({ db }).findBySlug('tern-1')),
  run: async ({ db, log, accountIds }) => {
    const engineerId = accountIds['engineer@saltmarsh.example'] ?? null;
    const repo = createSpacecraftRepository({ db });
    const craft = await repo.create(engineerId, {
      name: 'Tern-1',
      slug: 'tern-1',
      catalogNumber: TERN1.catalogNumber,
      internationalDesignator: TERN1.internationalDesignator,
      massKg: TERN1.craft.massKg,
      sailAreaM2: TERN1.craft.sailAreaM2,
      sailReflectivity: TERN1.craft.reflectivity,
      dragCoefficient: TERN1.craft.dragCoefficient,
      dragAreaEdgeOnM2: TERN1.craft.dragAreaEdgeOnM2,
      launchDate: new Date(TERN1.startMs - 12 * DAY_MS).toISOString().slice(0, 10),
      sailDeployedAt: new Date(TERN1.startMs + TERN1.deploymentDay * DAY_MS).toISOString(),
      isMissionCraft: true,
    });
    const history = simulateTern1();
    const orbit = createOrbitModule({ db });
    // Two files, as an engineer would have received them, each through upload → preview → import.
    const split = TERN1.startMs + 200 * DAY_MS;
    const parts = [
      { filename: 'tern-1-sets-first-200-days.tle', sets: history.sets.filter((s) => s.epochMs < split) },
      { filename: 'tern-1-sets-to-date.tle', sets: history.sets.filter((s) => s.epochMs >= split) },
    ];
    for (const part of parts) {
      const job = await orbit.ingest.ingestText({
        spacecraftId: craft.id,
        accountId: engineerId,
        filename: part.filename,
        text: formatTleFile(part.sets, { withNames: true }),
      });
      if (job.status !== 'imported') throw new Error(`seeding ${part.filename} ended ${job.status}: ${job.message}`);
      log(`  ${part.filename}: ${job.message}`);
    }
    for (const p of history.periods) {
      await orbit.orbit.createSailingPeriod(engineerId, craft.id, {
        startAt: new Date(p.startMs).toISOString(),
        endAt: new Date(p.endMs).toISOString(),
        mode: p.mode,
        note: PERIOD_NOTES[p.mode] ?? '',
      });
    }
    const endMs = TERN1.startMs + TERN1.days * DAY_MS;
    if (engineerId) {
      const snap = await orbit.snapshots.create(engineerId, {
        spacecraftId: craft.id,
        title: 'Tern-1: four months of sailing',
        caption:
          'Each raising period lifts apogee while drag slowly lowers perigee. Shaded bands are the sailing periods from the log; dashed lines are robust rates over the last 30 days.',
        fromMs: endMs - 120 * DAY_MS,
        toMs: endMs,
        rateFromMs: endMs - 30 * DAY_MS,
        rateToMs: endMs,
        series: ['apogee', 'perigee', 'meanAltitude'],
        annotations: [{ atMs: TERN1.startMs + 300 * DAY_MS, text: 'Raising resumed' }],
        isPublic: true,
      });
      log(`  public snapshot: ${snap.publicPath}`);
    }
  },
};
