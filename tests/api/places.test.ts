// Saved places (my support) and the pass-reminder job: a place is stored only when the backer saves it, and
// one reminder e-mail goes out per good pass over a place whose owner turned reminders on.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pino from 'pino';
import { eq } from 'drizzle-orm';
import { ecfToLookAngles, eciToEcf, gstime, propagate, twoline2satrec } from 'satellite.js';
import { agentFor, createTestApp, signIn, type Agent, type TestApp } from '../setup/test-app';
import { DEMO_PASSWORD, seedDemoAccounts } from '../../server/demo/accounts';
import { createSpacecraftRepository } from '../../server/modules/orbit/spacecraft.repository';
import { createOrbitModule } from '../../server/modules/orbit/orbit.routes';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { simulateTern1, TERN1 } from '../../shared/orbit/simulate';
import { findVisiblePasses } from '../../shared/orbit/passes';
import { runPassReminders } from '../../server/jobs/pass-reminders';
import { passReminders, savedPlaces } from '../../server/modules/places/places.tables';
import { mailQueue } from '../../server/modules/mail/mail.tables';
import { elementSets } from '../../server/modules/orbit/orbit.tables';

let t: TestApp;
let backer: Agent;
let other: Agent;
const logger = pino({ level: 'silent' });

beforeAll(async () => {
  t = await createTestApp({ SIGN_IN_LIMIT_PER_IP: '1000' });
  const ids = await seedDemoAccounts(t.database.db);
  backer = agentFor(t.app);
  await signIn(backer, 'backer@saltmarsh.example', DEMO_PASSWORD);
  other = agentFor(t.app);
  await signIn(other, 'outreach@saltmarsh.example', DEMO_PASSWORD);
  // The demo orbit: Tern-1 as the mission craft with the last ten element sets of its simulated history.
  const craft = await createSpacecraftRepository({ db: t.database.db }).create(ids['engineer@saltmarsh.example'] ?? null, {
    name: 'Tern-1',
    slug: 'tern-1',
    catalogNumber: TERN1.catalogNumber,
    internationalDesignator: TERN1.internationalDesignator,
    massKg: TERN1.craft.massKg,
    sailAreaM2: TERN1.craft.sailAreaM2,
    sailReflectivity: TERN1.craft.reflectivity,
    dragCoefficient: TERN1.craft.dragCoefficient,
    dragAreaEdgeOnM2: TERN1.craft.dragAreaEdgeOnM2,
    launchDate: '2025-10-08',
    sailDeployedAt: null,
    isMissionCraft: true,
  });
  const sets = simulateTern1().sets.slice(-10);
  const job = await createOrbitModule({ db: t.database.db }).ingest.ingestText({
    spacecraftId: craft.id,
    accountId: null,
    filename: 'tern-1-latest.tle',
    text: formatTleFile(sets, { withNames: true }),
  });
  expect(job.status).toBe('imported');
}, 90_000);
afterAll(async () => t?.close());

const save = (agent: Agent, body: Record<string, unknown>) =>
  agent.post('/api/my-support/places').set('x-csrf-token', agent.csrf).send(body);
const harbourHill = { name: 'Harbour hill', latitudeDeg: -41.3, longitudeDeg: 174.8, timeZone: 'Pacific/Auckland' };

describe('saved places', () => {
  it('stores nothing until the backer saves a place, then lists and deletes it', async () => {
    expect(await t.database.db.$count(savedPlaces)).toBe(0);
    expect((await backer.get('/api/my-support/places').expect(200)).body).toEqual({ places: [], passReminders: false, max: 10 });
    const created = (await save(backer, { ...harbourHill, name: '  Dune top  ' }).expect(201)).body.place;
    expect(created).toMatchObject({ name: 'Dune top', latitudeDeg: -41.3, longitudeDeg: 174.8, timeZone: 'Pacific/Auckland' });
    const list = (await backer.get('/api/my-support/places').expect(200)).body;
    expect(list.places.map((p: { name: string }) => p.name)).toEqual(['Dune top']);
    // Someone else neither sees nor deletes it.
    expect((await other.get('/api/my-support/places').expect(200)).body.places).toEqual([]);
    await other.delete(`/api/my-support/places/${created.id}`).set('x-csrf-token', other.csrf).expect(404);
    await backer.delete(`/api/my-support/places/${created.id}`).set('x-csrf-token', backer.csrf).expect(204);
    expect(await t.database.db.$count(savedPlaces)).toBe(0);
    await backer.delete(`/api/my-support/places/${created.id}`).set('x-csrf-token', backer.csrf).expect(404);
  });

  it('refuses bad input field by field, and writes nothing', async () => {
    const cases: [Record<string, unknown>, string, string][] = [
      [{ ...harbourHill, name: '' }, 'body.name', 'Give the place a name, e.g. "Back garden"'],
      [{ ...harbourHill, name: 'x'.repeat(61) }, 'body.name', 'Keep the name to 60 characters'],
      [{ ...harbourHill, latitudeDeg: 91 }, 'body.latitudeDeg', 'The latitude is between -90° (south pole) and 90° (north pole).'],
      [{ ...harbourHill, longitudeDeg: -180.5 }, 'body.longitudeDeg', 'The longitude is between -180° (west) and 180° (east).'],
      // A typed text or an empty value is never read as 0°, which is a real place.
      [{ ...harbourHill, latitudeDeg: '' }, 'body.latitudeDeg', 'Type the latitude in degrees, e.g. -41.3 for the south.'],
      [{ ...harbourHill, longitudeDeg: null }, 'body.longitudeDeg', 'Type the longitude in degrees, e.g. 174.8 for the east.'],
      [{ ...harbourHill, timeZone: 'Harbour/Standard' }, 'body.timeZone', 'is not a time zone name such as "Europe/Lisbon" or "UTC"'],
    ];
    for (const [body, path, message] of cases) {
      const res = await save(backer, body).expect(400);
      expect(res.body.error.details, JSON.stringify(body)).toEqual([{ path, message }]);
    }
    expect(await t.database.db.$count(savedPlaces)).toBe(0);
  });

  it('keeps names unique per backer (any case) and at most ten places', async () => {
    await save(backer, harbourHill).expect(201);
    const twice = await save(backer, { ...harbourHill, name: 'HARBOUR HILL' }).expect(400);
    expect(twice.body.error).toMatchObject({
      code: 'places.name_taken',
      details: [{ path: 'name', message: 'is already the name of one of your places' }],
    });
    await save(other, harbourHill).expect(201);
    for (let i = 2; i <= 10; i++) await save(backer, { ...harbourHill, name: `Spot ${i}` }).expect(201);
    const eleventh = await save(backer, { ...harbourHill, name: 'Spot 11' }).expect(409);
    expect(eleventh.body.error.message).toBe('You can keep up to 10 places; delete one to save another.');
    // Leave Harbour hill alone for the reminder tests.
    for (const p of (await backer.get('/api/my-support/places')).body.places) {
      if (p.name !== 'Harbour hill') await backer.delete(`/api/my-support/places/${p.id}`).set('x-csrf-token', backer.csrf).expect(204);
    }
  });
});

/** Elevation of the craft over the place, in degrees, straight from satellite.js (independent of shared/orbit/passes.ts). */
function elevationDeg(line1: string, line2: string, lat: number, lon: number, atMs: number) {
  const satrec = twoline2satrec(line1, line2);
  const at = new Date(atMs);
  const pv = propagate(satrec, at)!;
  const look = ecfToLookAngles(
    { latitude: (lat * Math.PI) / 180, longitude: (lon * Math.PI) / 180, height: 0 },
    eciToEcf(pv.position as { x: number; y: number; z: number }, gstime(at)),
  );
  return (look.elevation * 180) / Math.PI;
}

describe('pass reminders', () => {
  // A fixed "now": the newest demo set's epoch is 2026-11-23T21:19Z, so the next day's passes are well predicted.
  const now = Date.UTC(2026, 10, 26, 0, 0, 0);

  it('e-mails nobody until the owner turns reminders on', async () => {
    const result = await runPassReminders({ db: t.database.db, config: t.config, logger }, now);
    expect(result).toMatchObject({ places: 0, queued: 0 });
    expect(await t.database.db.$count(mailQueue)).toBe(0);
  });

  it('queues one reminder per good pass over Harbour hill in the next 24 h, never twice, with the cautions and an unsubscribe link', async () => {
    const on = await backer.put('/api/my-support/places/reminders').set('x-csrf-token', backer.csrf).send({ enabled: true }).expect(200);
    expect(on.body.passReminders).toBe(true);
    await backer.put('/api/my-support/places/reminders').set('x-csrf-token', backer.csrf).send({ enabled: 'yes' }).expect(400);

    // Expected, computed here from the stored newest set: visible passes (findVisiblePasses), at least 40° high.
    const [latest] = await t.database.db.select().from(elementSets).orderBy(elementSets.epochMs).limit(1).offset(9);
    const expected = findVisiblePasses({
      satrec: twoline2satrec(latest!.line1, latest!.line2),
      observer: { latitudeDeg: -41.3, longitudeDeg: 174.8 },
      fromMs: now,
      toMs: now + 24 * 3_600_000,
    }).filter((p) => p.highest.elevationDeg >= 40);
    // One such pass (found when this test was written): highest at 2026-11-26T13:45:03Z, 74.4° up.
    expect(expected).toHaveLength(1);
    const pass = expected[0]!;
    expect(new Date(pass.highest.atMs).toISOString().slice(0, 16)).toBe('2026-11-26T13:45');
    expect(pass.highest.elevationDeg).toBeCloseTo(74.4, 1);
    // Cross-check of the peak against a plain 1-second scan of satellite.js look angles over the pass.
    let peak = -90;
    for (let ms = pass.start.atMs; ms <= pass.end.atMs; ms += 1000)
      peak = Math.max(peak, elevationDeg(latest!.line1, latest!.line2, -41.3, 174.8, ms));
    expect(Math.abs(peak - pass.highest.elevationDeg)).toBeLessThan(0.1);

    const first = await runPassReminders({ db: t.database.db, config: t.config, logger }, now);
    expect(first).toMatchObject({ places: 1, passes: 1, queued: 1 });
    // The next hourly runs see the same pass again: nothing more is queued.
    expect(await runPassReminders({ db: t.database.db, config: t.config, logger }, now + 3_600_000)).toMatchObject({ queued: 0 });
    expect(await runPassReminders({ db: t.database.db, config: t.config, logger }, now + 7_200_000)).toMatchObject({ queued: 0 });
    const rows = await t.database.db.select().from(passReminders);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.passKey).toMatch(/\/2026-11-26T13:45$/);
    const queued = await t.database.db.select().from(mailQueue).where(eq(mailQueue.template, 'pass-reminder'));
    expect(queued).toHaveLength(1);
    expect(queued[0]!.idempotencyKey).toBe(`pass-reminder/${rows[0]!.passKey}`);
    expect(queued[0]!.toAddress).toBe('backer@saltmarsh.example');

    await t.flushMail();
    const [mail] = t.mail.messages().filter((m) => m.to.includes('backer@saltmarsh.example'));
    // 13:40Z in Pacific/Auckland is 02:40 NZDT (UTC+13) on Friday 27 November (Python zoneinfo).
    expect(mail!.subject).toBe('Tern-1 passes over Harbour hill, up to 74° high: Friday 27 November, 02:40 GMT+13');
    const text = mail!.text!.replace(/\s*\n\s*/g, ' ');
    expect(text).toContain('Never look at or near the Sun');
    expect(text).toContain('Times shift by minutes as the orbit slowly decays: check the newest times on the site');
    expect(text).toContain('http://127.0.0.1:3999/sky-watch?lat=-41.3&lon=174.8');
    const unsubscribe = /http:\/\/127\.0\.0\.1:3999\/unsubscribe\?token=([\w.-]+)/.exec(text);
    expect(unsubscribe).not.toBeNull();

    // The link in the e-mail turns reminders off without signing in; the next day's passes then send nothing.
    const off = await agentFor(t.app).post(`/api/email-choices/unsubscribe?token=${unsubscribe![1]}`).expect(200);
    expect(off.body).toEqual({ category: 'passReminders', subscribed: false });
    expect((await backer.get('/api/my-support/places').expect(200)).body.passReminders).toBe(false);
    expect(await runPassReminders({ db: t.database.db, config: t.config, logger }, now + 86_400_000)).toMatchObject({
      places: 0,
      queued: 0,
    });
  });

  it('says nothing from an element set too old to trust', async () => {
    await backer.put('/api/my-support/places/reminders').set('x-csrf-token', backer.csrf).send({ enabled: true }).expect(200);
    const late = await runPassReminders({ db: t.database.db, config: t.config, logger }, Date.UTC(2027, 0, 15));
    expect(late).toEqual({ places: 0, passes: 0, queued: 0, skipped: 'the newest element set is too old to predict passes' });
  });
});
