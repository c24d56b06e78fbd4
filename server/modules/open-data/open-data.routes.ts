// Open data: the mission's element-set history for anyone (CCSDS OMM XML and JSON, CSV with the OMM keywords),
// and the newest set that the public pages propagate in the browser (where it is now, sky watch).
import { Router } from 'express';
import { z } from 'zod';
import type pg from 'pg';
import { validated } from '../../middleware/validate';
import { notFound } from '../../errors';
import { formatOmmCsv, formatOmmJson, formatOmmXml, type OmmWriteInput } from '../../../shared/orbit/omm-write';
import { formatCatalogNumber } from '../../../shared/orbit/catalog-number';
import { SAFETY_CAUTION } from '../orbit/orbit.service';

const slugParam = z.object({ slug: z.string().regex(/^[a-z0-9-]{1,40}$/, { message: 'must be a spacecraft handle' }) });
const noSpacecraft = () => notFound('open_data.spacecraft_not_found', 'There is no spacecraft with this handle.');

type SetRow = {
  name: string;
  catalog_number_int: number;
  classification: 'U' | 'C' | 'S';
  international_designator: string;
  epoch_ms: number;
  mean_motion_rev_per_day: number;
  mean_motion_dot_rev_per_day2: number;
  mean_motion_ddot_rev_per_day3: number;
  bstar: number;
  inclination_deg: number;
  raan_deg: number;
  eccentricity: number;
  arg_perigee_deg: number;
  mean_anomaly_deg: number;
  element_set_no: number;
  rev_at_epoch: number;
};

const toWriteInput = (r: SetRow): OmmWriteInput => ({
  name: r.name.toUpperCase(),
  catalogNumber: formatCatalogNumber(r.catalog_number_int),
  catalogNumberInt: r.catalog_number_int,
  classification: r.classification,
  internationalDesignator: r.international_designator,
  epochMs: r.epoch_ms,
  meanMotionRevPerDay: r.mean_motion_rev_per_day,
  meanMotionDotRevPerDay2: r.mean_motion_dot_rev_per_day2,
  meanMotionDdotRevPerDay3: r.mean_motion_ddot_rev_per_day3,
  bstar: r.bstar,
  inclinationDeg: r.inclination_deg,
  raanDeg: r.raan_deg,
  eccentricity: r.eccentricity,
  argPerigeeDeg: r.arg_perigee_deg,
  meanAnomalyDeg: r.mean_anomaly_deg,
  elementSetNo: r.element_set_no,
  revAtEpoch: r.rev_at_epoch,
});

const FORMATS = {
  xml: {
    type: 'application/xml; charset=utf-8',
    write: (sets: OmmWriteInput[]) => formatOmmXml(sets, { creationMs: Date.now(), originator: 'LIGHTKEEL' }),
  },
  json: { type: 'application/json; charset=utf-8', write: formatOmmJson },
  csv: { type: 'text/csv; charset=utf-8', write: formatOmmCsv },
} as const;

export function createOpenDataRouter({ pool }: { pool: pg.Pool }) {
  const router = Router();

  router.get(
    '/:slug/latest-set',
    validated({ params: slugParam }, async (_req, res, { params }) => {
      const { rows } = await pool.query<{ name: string; slug: string; line1: string; line2: string; epoch: Date }>(
        `select s.name, s.slug, e.line1, e.line2, e.epoch from spacecraft s
           left join lateral (select line1, line2, epoch from element_sets
                               where spacecraft_id = s.id and not outlier order by epoch_ms desc limit 1) e on true
          where s.slug = $1`,
        [params.slug],
      );
      const row = rows[0];
      if (!row) throw noSpacecraft();
      res.set('cache-control', 'public, max-age=60').json({
        spacecraft: { name: row.name, slug: row.slug },
        latest: row.line1 ? { line1: row.line1, line2: row.line2, epoch: row.epoch.toISOString() } : null,
        caution: SAFETY_CAUTION,
      });
    }),
  );

  router.get(
    '/:slug/element-sets.:format',
    validated(
      { params: slugParam.extend({ format: z.enum(['xml', 'json', 'csv'], { message: 'must be xml, json or csv' }) }) },
      async (_req, res, { params }) => {
        const { rows: craft } = await pool.query<{ id: string; name: string }>('select id, name from spacecraft where slug = $1', [
          params.slug,
        ]);
        if (!craft[0]) throw noSpacecraft();
        const { rows } = await pool.query<SetRow>(
          `select $2::text as name, catalog_number_int, classification,
                  international_designator, epoch_ms, mean_motion_rev_per_day, mean_motion_dot_rev_per_day2,
                  mean_motion_ddot_rev_per_day3, bstar, inclination_deg, raan_deg, eccentricity, arg_perigee_deg,
                  mean_anomaly_deg, element_set_no, rev_at_epoch
             from element_sets where spacecraft_id = $1 order by epoch_ms, element_set_no`,
          [craft[0].id, craft[0].name],
        );
        const f = FORMATS[params.format];
        res
          .set('content-type', f.type)
          .set('content-disposition', `attachment; filename="${params.slug}-element-sets.${params.format}"`)
          .set('cache-control', 'public, max-age=300')
          .send(f.write(rows.map(toWriteInput)));
      },
    ),
  );

  return router;
}
