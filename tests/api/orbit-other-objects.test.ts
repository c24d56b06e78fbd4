import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../setup/test-app';
import { formatTleFile } from '../../shared/orbit/tle-write';
import { countRows, importUpload, orbitDesk, tern1Set, uploadAndPreview } from './orbit-helpers';

let t: TestApp;
let engineer: Agent;
let tern1Id: string;

beforeAll(async () => {
  ({ t, engineer, spacecraftId: tern1Id } = await orbitDesk());
}, 60_000);
afterAll(async () => t.close());

// An OMM (CCSDS 502.0-B-2 KVN) of a reference object in a similar orbit: NORAD_CAT_ID stands on line 20.
const kvn = `CCSDS_OMM_VERS = 2.0
COMMENT a comparison object for the test
CREATION_DATE = 2026-01-20T00:00:00
ORIGINATOR = TEST
OBJECT_NAME = HERON REF
OBJECT_ID = 2015-077B
CENTER_NAME = EARTH
REF_FRAME = TEME
TIME_SYSTEM = UTC
MEAN_ELEMENT_THEORY = SGP4
EPOCH = 2026-01-10T12:00:00.000000
MEAN_MOTION = 14.3266
ECCENTRICITY = .0002
INCLINATION = 98.52
RA_OF_ASC_NODE = 50.0
ARG_OF_PERICENTER = 90.0
MEAN_ANOMALY = 270.0
EPHEMERIS_TYPE = 0
CLASSIFICATION_TYPE = U
NORAD_CAT_ID = 41001
ELEMENT_SET_NO = 12
REV_AT_EPOCH = 12143
BSTAR = .0021
MEAN_MOTION_DOT = .0000025
MEAN_MOTION_DDOT = 0
`;
const catLine = kvn.split('\n').findIndex((l) => l.startsWith('NORAD_CAT_ID')) + 1;

describe("another object's element sets", () => {
  it('are refused for the mission craft at the line where the catalog number stands, with the object described', async () => {
    expect(catLine).toBe(20);
    const before = await countRows(t, 'element_sets');
    const preview = await uploadAndPreview(engineer, tern1Id, kvn, 'heron-ref.omm');
    expect(preview.counts).toMatchObject({ records: 1, new: 0, invalid: 1 });
    expect(preview.errors).toEqual([
      {
        line: 20,
        field: 'NORAD_CAT_ID',
        message: "catalog number 41001 is not Tern-1's (" + (await tern1Catalog()) + ')',
        expected: await tern1Catalog(),
        object: { catalogNumber: '41001', name: 'HERON REF', internationalDesignator: '15077B' },
      },
    ]);
    expect(await countRows(t, 'element_sets')).toBe(before);
  });

  it('point at line 1 of a named two-line set, columns 3–7, not at its name line', async () => {
    const other = {
      ...tern1Set(3, 7),
      catalogNumber: '41001',
      catalogNumberInt: 41001,
      internationalDesignator: '15077B',
      name: 'HERON REF',
    };
    const text = formatTleFile([tern1Set(2, 6), other], { withNames: true });
    const preview = await uploadAndPreview(engineer, tern1Id, text, 'mixed.tle');
    // Set 1 is lines 1–3; set 2's name is line 4 and its line 1 is line 5.
    expect(preview.errors).toEqual([
      expect.objectContaining({
        line: 5,
        columns: [3, 7],
        field: 'catalog number',
        object: expect.objectContaining({ name: 'HERON REF' }),
      }),
    ]);
    expect(preview.counts).toMatchObject({ new: 1, invalid: 1 });
  });

  it('can be added as a spacecraft from what the file says, then uploaded for it', async () => {
    const preview = await uploadAndPreview(engineer, tern1Id, kvn, 'heron-ref.omm');
    const object = (preview.errors[0] as unknown as { object: { catalogNumber: string; name: string; internationalDesignator: string } })
      .object;
    // What the desk prefills: name, handle, catalog number and designator from the file; no sail.
    const created = await engineer.post('/api/orbit/spacecraft').set('x-csrf-token', engineer.csrf).send({
      name: object.name,
      slug: 'heron-ref',
      catalogNumber: object.catalogNumber,
      internationalDesignator: object.internationalDesignator,
      massKg: 50,
      dragCoefficient: 2.2,
      dragAreaEdgeOnM2: 0.5,
    });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body.spacecraft).toMatchObject({ catalogNumber: '41001', hasSail: false, isMissionCraft: false });
    const again = await uploadAndPreview(engineer, created.body.spacecraft.id, kvn, 'heron-ref.omm');
    expect(again.errors).toEqual([]);
    const done = await importUpload(engineer, again.id);
    expect(done.importedCount).toBe(1);
  });
});

async function tern1Catalog() {
  const res = await engineer.get(`/api/orbit/spacecraft/${tern1Id}`).expect(200);
  return res.body.spacecraft.catalogNumber as string;
}
