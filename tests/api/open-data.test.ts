// Open data on the public site: the element-set history as CCSDS OMM (XML, JSON) and CSV, and the newest set the
// browser propagates. Every download is read back by the product's own parser (itself checked against published
// references in tests/reference) and must give the stored two-line sets.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile, parseElementSets, writeTle } from '../../shared/orbit';
import { simulateTern1 } from '../../shared/orbit/simulate';
import { importUpload, orbitDesk, uploadAndPreview } from './orbit-helpers';

let t: TestApp;
let engineer: Agent;
let slug: string;
const history = simulateTern1({ days: 20 });

beforeAll(async () => {
  let craftId: string;
  ({ t, engineer, spacecraftId: craftId } = await orbitDesk());
  const craft = await engineer.get(`/api/orbit/spacecraft`).expect(200);
  slug = craft.body.spacecraft.find((c: { id: string }) => c.id === craftId).slug;
  const preview = await uploadAndPreview(engineer, craftId, formatTleFile(history.sets), 'tern-1.tle');
  await importUpload(engineer, preview.id);
}, 60_000);
afterAll(async () => t.close());

const canonical = (sets: { line1: string; line2: string }[]) => sets.map((s) => `${s.line1}\n${s.line2}`);

describe('open data downloads', () => {
  for (const format of ['xml', 'json', 'csv'] as const) {
    it(`gives every stored set as ${format.toUpperCase()}, readable by an OMM parser, to anyone`, async () => {
      const res = await request(t.app).get(`/api/public/orbit/${slug}/element-sets.${format}`).expect(200);
      expect(res.headers['content-disposition']).toBe(`attachment; filename="${slug}-element-sets.${format}"`);
      const back = parseElementSets(res.text);
      expect(back.errors).toEqual([]);
      expect(back.format).toBe(`omm-${format}`);
      const stored = await t.database.pool.query<{ line1: string; line2: string }>(
        'select line1, line2 from element_sets order by epoch_ms, element_set_no',
      );
      expect(stored.rows.length).toBeGreaterThan(50);
      expect(canonical(back.records.map(writeTle))).toEqual(canonical(stored.rows));
    });
  }

  it('answers 404 in words for an unknown craft and 400 for an unknown format', async () => {
    const missing = await request(t.app).get('/api/public/orbit/no-such-craft/element-sets.json').expect(404);
    expect(missing.body.error.message).toBe('There is no spacecraft with this handle.');
    const bad = await request(t.app).get(`/api/public/orbit/${slug}/element-sets.exe`).expect(400);
    expect(JSON.stringify(bad.body)).toContain('must be xml, json or csv');
  });

  it('gives the newest set for propagation in the browser, with the caution', async () => {
    const res = await request(t.app).get(`/api/public/orbit/${slug}/latest-set`).expect(200);
    const newest = history.sets[history.sets.length - 1]!;
    expect(res.body.latest.line1).toBe(writeTle(newest).line1);
    expect(res.body.latest.line2).toBe(writeTle(newest).line2);
    expect(res.body.caution).toMatch(/not for collision or re-entry safety decisions/);
  });
});
