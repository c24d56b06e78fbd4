import { inArray } from 'drizzle-orm';
import { dispatches, dispatchVersions } from '../modules/dispatches/dispatches.tables';
import { TERN1 } from '../../shared/orbit/simulate';
import type { Seeder } from './seed';

const DAY_MS = 86_400_000;

// Two published dispatches from outreach, so the mission page and the dispatch feed show what a reader gets. The
// story follows the simulated Tern-1 history (shared/orbit/simulate.ts): the sail opens on day 12, tumbles, then
// alternates edge-on and sail-raising periods; the figures quoted are the rounded ones the orbit summary shows.
const seeded = [
  {
    slug: 'the-sail-is-open',
    title: 'The sail is open',
    publishedDay: TERN1.deploymentDay + 2,
    bodyMarkdown: `Two days ago the four booms pushed Tern-1's sail out to its full 24 m². The ground station heard the boom motors stop right on time, and the current drawn by the craft dropped just as it did on the clubhouse floor.

For now the sail turns slowly end over end: nothing controls which way it faces yet. That is expected. Over the next week the reaction wheel will learn to hold it still, and then the real work starts.

**What happens next**

- First, weeks with the sail held *edge-on*, like a knife through the thin air, to measure how fast the orbit falls with no push at all.
- Then the sail turns *face-on* to the Sun on the part of each orbit where that helps, and we compare.

We will tell you as soon as the numbers say something.`,
  },
  {
    slug: 'a-year-of-sailing',
    title: 'A year of sailing: the high point of the orbit is 140 km higher',
    publishedDay: TERN1.deploymentDay + 370,
    bodyMarkdown: `A year after the sail opened, the highest point of Tern-1's orbit sits about 140 km above where it started. The lowest point has sunk by a few tens of kilometres, so the orbit has stretched rather than simply risen.

**Why it stretches.** The sail only pushes on the half of each orbit where facing the Sun speeds the craft up. A push there lifts the far side of the orbit; the near side keeps feeling the drag of the thin air.

**Why some months look flat.** In the edge-on months we hold the sail like a knife on purpose: they show how fast the orbit would fall without the sail, so we can tell its push apart from the drag. Two weeks of safe mode in the spring, after a wheel reset, look flat for a less planned reason.

Every element set behind these numbers is on the mission page as open data: download it and check our sums.`,
  },
];

export const dispatchSeeder: Seeder = {
  name: 'Tern-1 dispatches',
  isSeeded: async (db) =>
    (
      await db
        .select({ id: dispatches.id })
        .from(dispatches)
        .where(
          inArray(
            dispatches.slug,
            seeded.map((d) => d.slug),
          ),
        )
        .limit(1)
    ).length > 0,
  run: async ({ db, accountIds }) => {
    const authorId = accountIds['outreach@saltmarsh.example'] ?? null;
    await db.transaction(async (tx) => {
      for (const d of seeded) {
        const publishedAt = new Date(TERN1.startMs + d.publishedDay * DAY_MS + 17 * 3_600_000);
        const [row] = await tx
          .insert(dispatches)
          .values({
            slug: d.slug,
            title: d.title,
            bodyMarkdown: d.bodyMarkdown,
            audienceKind: 'everyone',
            state: 'published',
            publishedAt,
            version: 1,
            authorId,
            createdAt: publishedAt,
            updatedAt: publishedAt,
          })
          .returning({ id: dispatches.id });
        await tx.insert(dispatchVersions).values({
          dispatchId: row!.id,
          version: 1,
          title: d.title,
          bodyMarkdown: d.bodyMarkdown,
          charts: [],
          editedBy: authorId,
          createdAt: publishedAt,
        });
      }
    });
  },
};
