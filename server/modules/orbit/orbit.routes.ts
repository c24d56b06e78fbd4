import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import type { Db } from '../../db/client';
import type { Config } from '../../config';
import type { JobSender } from '../../jobs/queue';
import { validated } from '../../middleware/validate';
import { safeText } from '../../../shared/schemas/text';
import { requireRole } from '../../middleware/auth';
import { AppError } from '../../errors';
import {
  createSnapshotSchema,
  historyQuerySchema,
  sailingPeriodInputSchema,
  spacecraftInputSchema,
  trendQuerySchema,
  trendRatesQuerySchema,
  trendViewQuerySchema,
  updateSnapshotSchema,
  uploadFieldsSchema,
  uploadFileSchema,
  uploadStatusQuerySchema,
} from '../../../shared/schemas/orbit';
import type { SnapshotData } from '../../../shared/charts/snapshot-chart';
import type { OrbitReply } from '../../../shared/schemas/orbit-replies';
import { createSpacecraftRepository, spacecraftView } from './spacecraft.repository';
import { createIngestService, type IngestService } from './ingest.service';
import { createOrbitService, type OrbitService } from './orbit.service';
import { createSnapshotsService, type SnapshotsService } from './snapshots.service';
import { renderSnapshotPng, renderSnapshotSvg } from './snapshot-render';
import { emptyUpload, fileTooLarge } from './orbit.errors';

type Logger = { error: (obj: unknown, msg?: string) => void };

export type OrbitModule = { ingest: IngestService; orbit: OrbitService; snapshots: SnapshotsService };

const msOrUndefined = (iso: string | undefined) => (iso ? Date.parse(iso) : undefined);
/** The trend's rate window, as the query names it (`from`, `to`). */
const rateWindow = (q: { from?: string; to?: string }) => ({ fromMs: msOrUndefined(q.from), toMs: msOrUndefined(q.to) });
/** The chart's view, as the query names it (`viewFrom`, `viewTo`, `columns`). */
const chartView = (q: { viewFrom?: string; viewTo?: string; columns: number }) => ({
  fromMs: msOrUndefined(q.viewFrom),
  toMs: msOrUndefined(q.viewTo),
  columns: q.columns,
});

export function createOrbitModule({
  db,
  logger,
  jobs,
  config,
}: {
  db: Db;
  logger?: Logger;
  jobs?: JobSender;
  config?: Pick<Config, 'INGEST_JOB_EXPIRE_SECONDS'>;
}): OrbitModule {
  const orbit = createOrbitService({ db });
  return {
    ingest: createIngestService({ db, logger, jobs, expireInSeconds: config?.INGEST_JOB_EXPIRE_SECONDS }),
    orbit,
    snapshots: createSnapshotsService({ db, orbit }),
  };
}

const engineers = requireRole('engineer', 'admin');
const staff = requireRole('outreach', 'engineer', 'admin');

const idParams = z.object({ id: z.uuid({ message: 'must be an id' }) });
const jobParams = z.object({ jobId: z.uuid({ message: 'must be an upload id' }) });
const fileParams = z.object({ fileId: z.uuid({ message: 'must be a file id' }) });
const periodParams = z.object({ periodId: z.uuid({ message: 'must be a sailing-period id' }) });

/** multer with its errors turned into ours: the size limit named in the message. */
function uploadMiddleware(limitBytes: number): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: limitBytes, fieldSize: limitBytes, files: 1, fields: 4 },
  }).single('file');
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      const code = (err as { code?: string }).code;
      if (code === 'LIMIT_FILE_SIZE' || code === 'LIMIT_FIELD_VALUE') return next(fileTooLarge(limitBytes));
      if (err instanceof multer.MulterError) {
        return next(
          new AppError(
            400,
            'orbit.bad_upload',
            `The upload could not be read (${err.message}). Send one file in the field "file", or pasted text in the field "text".`,
          ),
        );
      }
      return next(
        new AppError(
          400,
          'orbit.bad_upload',
          'The upload could not be read. Send one file in the field "file", or pasted text in the field "text".',
        ),
      );
    });
  };
}

function sendCsvOrText(res: Parameters<RequestHandler>[1], type: string, filename: string, body: string | Buffer) {
  res.setHeader('content-type', type);
  res.setHeader('content-disposition', `attachment; filename="${filename.replace(/[^\w.-]+/g, '_')}"`);
  res.send(body);
}

/** A CSV download written chunk by chunk as it is produced, waiting whenever the client reads slower. */
async function sendCsvChunks(res: Parameters<RequestHandler>[1], filename: string, chunks: Iterable<string>) {
  res.setHeader('content-type', 'text/csv; charset=utf-8');
  res.setHeader('content-disposition', `attachment; filename="${filename.replace(/[^\w.-]+/g, '_')}"`);
  for (const chunk of chunks) {
    if (res.destroyed) return;
    if (!res.write(chunk))
      await new Promise<void>((resolve) => {
        const done = () => {
          res.off('drain', done);
          res.off('close', done);
          resolve();
        };
        res.on('drain', done);
        res.on('close', done);
      });
  }
  res.end();
}

export function createOrbitRouter({ db, config, module }: { db: Db; config: Config; module: OrbitModule }) {
  const router = Router();
  const repo = createSpacecraftRepository({ db });
  const { ingest, orbit, snapshots } = module;

  // Spacecraft records
  router.get('/spacecraft', staff, async (_req, res) => {
    res.json({ spacecraft: (await repo.list()).map(spacecraftView) });
  });
  router.post(
    '/spacecraft',
    engineers,
    validated({ body: spacecraftInputSchema }, async (req, res, { body }) => {
      res.status(201).json({ spacecraft: spacecraftView(await repo.create(req.user!.id, body)) });
    }),
  );
  router.get(
    '/spacecraft/:id',
    staff,
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json({ spacecraft: spacecraftView(await repo.get(params.id)) });
    }),
  );
  router.put(
    '/spacecraft/:id',
    engineers,
    validated({ params: idParams, body: spacecraftInputSchema }, async (req, res, { params, body }) => {
      res.json({ spacecraft: spacecraftView(await repo.update(req.user!.id, params.id, body)) });
    }),
  );

  // Upload → preview → import or cancel
  router.post(
    '/spacecraft/:id/uploads',
    engineers,
    uploadMiddleware(config.UPLOAD_LIMIT_BYTES),
    validated({ params: idParams, body: uploadFieldsSchema, file: uploadFileSchema }, async (req, res, { params, body, file }) => {
      let bytes: Buffer | undefined = req.file?.buffer;
      let filename = file?.name ?? '';
      if (!bytes && body.text !== undefined) {
        bytes = Buffer.from(body.text, 'utf8');
        filename = body.filename || 'pasted.txt';
      }
      if (!bytes) throw emptyUpload();
      const job = await ingest.startUpload({ spacecraftId: params.id, accountId: req.user!.id, filename, bytes });
      res.status(202).json({ upload: job });
    }),
  );
  router.get(
    '/uploads/:jobId',
    engineers,
    validated({ params: jobParams, query: uploadStatusQuerySchema }, async (_req, res, { params, query }) => {
      // A held request lets go when its client does.
      const gone = new AbortController();
      res.on('close', () => gone.abort());
      res.json({ upload: await ingest.getJob(params.jobId, { after: query.after, waitMs: query.wait * 1000, signal: gone.signal }) });
    }),
  );
  router.post(
    '/uploads/:jobId/import',
    engineers,
    validated({ params: jobParams }, async (req, res, { params }) => {
      res.status(202).json({ upload: await ingest.importUpload(params.jobId, req.user!.id) });
    }),
  );
  router.post(
    '/uploads/:jobId/cancel',
    engineers,
    validated({ params: jobParams }, async (req, res, { params }) => {
      res.json({ upload: await ingest.cancelUpload(params.jobId, req.user!.id) });
    }),
  );
  router.get(
    '/spacecraft/:id/files',
    engineers,
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json({ files: await orbit.listFiles(params.id) });
    }),
  );
  router.get(
    '/files/:fileId/original',
    engineers,
    validated({ params: fileParams }, async (_req, res, { params }) => {
      const f = await orbit.getFileOriginal(params.fileId);
      sendCsvOrText(res, 'text/plain; charset=utf-8', f.filename, f.content);
    }),
  );

  // History, trend, sail yield
  router.get(
    '/spacecraft/:id/element-sets',
    engineers,
    validated({ params: idParams, query: historyQuerySchema }, async (_req, res, { params, query }) => {
      res.json(await orbit.listHistory(params.id, query));
    }),
  );
  router.get(
    '/spacecraft/:id/element-sets.csv',
    engineers,
    validated({ params: idParams, query: historyQuerySchema }, async (_req, res, { params, query }) => {
      await sendCsvChunks(res, 'element-sets.csv', await orbit.historyCsv(params.id, query));
    }),
  );
  router.get(
    '/spacecraft/:id/trend',
    engineers,
    validated({ params: idParams, query: trendQuerySchema }, async (_req, res, { params, query }) => {
      res.json(await orbit.getTrendView(params.id, rateWindow(query), chartView(query)));
    }),
  );
  router.get(
    '/spacecraft/:id/trend/view',
    engineers,
    validated({ params: idParams, query: trendViewQuerySchema }, async (_req, res, { params, query }) => {
      res.json(await orbit.getChartView(params.id, chartView(query)));
    }),
  );
  router.get(
    '/spacecraft/:id/trend/rates',
    engineers,
    validated({ params: idParams, query: trendRatesQuerySchema }, async (_req, res, { params, query }) => {
      res.json(await orbit.getRateWindow(params.id, rateWindow(query)));
    }),
  );
  router.get(
    '/spacecraft/:id/sail-yield',
    engineers,
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json(await orbit.getSailYield(params.id));
    }),
  );

  // Sailing-period log
  router.get(
    '/spacecraft/:id/sailing-periods',
    engineers,
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json({ sailingPeriods: await orbit.listSailingPeriods(params.id) });
    }),
  );
  router.post(
    '/spacecraft/:id/sailing-periods',
    engineers,
    validated({ params: idParams, body: sailingPeriodInputSchema }, async (req, res, { params, body }) => {
      res.status(201).json({ sailingPeriod: await orbit.createSailingPeriod(req.user!.id, params.id, body) });
    }),
  );
  router.put(
    '/sailing-periods/:periodId',
    engineers,
    validated({ params: periodParams, body: sailingPeriodInputSchema }, async (req, res, { params, body }) => {
      res.json({ sailingPeriod: await orbit.updateSailingPeriod(req.user!.id, params.periodId, body) });
    }),
  );
  router.delete(
    '/sailing-periods/:periodId',
    engineers,
    validated({ params: periodParams }, async (req, res, { params }) => {
      await orbit.deleteSailingPeriod(req.user!.id, params.periodId);
      res.status(204).end();
    }),
  );

  // Snapshots: engineers write, outreach reads (to pick them for dispatches)
  router.get(
    '/snapshots',
    staff,
    validated(
      { query: z.object({ mine: z.enum(['true', 'false']).optional(), spacecraftId: z.uuid().optional() }) },
      async (req, res, { query }) => {
        res.json({
          snapshots: await snapshots.list({ ownerId: query.mine === 'true' ? req.user!.id : undefined, spacecraftId: query.spacecraftId }),
        });
      },
    ),
  );
  router.post(
    '/snapshots',
    engineers,
    validated({ body: createSnapshotSchema }, async (req, res, { body }) => {
      res.status(201).json({ snapshot: await snapshots.create(req.user!.id, body) });
    }),
  );
  router.get(
    '/snapshots/:id',
    staff,
    validated({ params: idParams }, async (_req, res, { params }) => {
      res.json({ snapshot: await snapshots.get(params.id) });
    }),
  );
  router.patch(
    '/snapshots/:id',
    engineers,
    validated({ params: idParams, body: updateSnapshotSchema }, async (req, res, { params, body }) => {
      res.json({ snapshot: await snapshots.update(req.user!, params.id, body) });
    }),
  );
  router.delete(
    '/snapshots/:id',
    engineers,
    validated({ params: idParams }, async (req, res, { params }) => {
      await snapshots.remove(req.user!, params.id);
      res.status(204).end();
    }),
  );
  router.get(
    '/snapshots/:id/chart.svg',
    staff,
    validated({ params: idParams }, async (_req, res, { params }) => {
      const row = await snapshots.getRow(params.id);
      res.type('image/svg+xml').send(renderSnapshotSvg({ title: row.title, caption: row.caption, data: row.data as SnapshotData }));
    }),
  );
  router.get(
    '/snapshots/:id/chart.png',
    staff,
    validated({ params: idParams }, async (_req, res, { params }) => {
      const row = await snapshots.getRow(params.id);
      res.type('image/png').send(renderSnapshotPng({ title: row.title, caption: row.caption, data: row.data as SnapshotData }));
    }),
  );
  return router;
}

const slugParams = z.object({ slug: safeText().regex(/^[a-z0-9-]{1,80}$/, { message: 'must be a snapshot link' }) });

/** Anyone: published snapshots. */
export function createPublicSnapshotsRouter({ module }: { module: OrbitModule }) {
  const router = Router();
  const { snapshots } = module;
  router.get(
    '/:slug.svg',
    validated({ params: slugParams }, async (_req, res, { params }) => {
      const row = await snapshots.getPublic(params.slug);
      res
        .set('cache-control', 'public, max-age=300')
        .type('image/svg+xml')
        .send(renderSnapshotSvg({ title: row.title, caption: row.caption, data: row.data as SnapshotData }));
    }),
  );
  router.get(
    '/:slug.png',
    validated({ params: slugParams }, async (_req, res, { params }) => {
      const row = await snapshots.getPublic(params.slug);
      res
        .set('cache-control', 'public, max-age=300')
        .type('image/png')
        .send(renderSnapshotPng({ title: row.title, caption: row.caption, data: row.data as SnapshotData }));
    }),
  );
  router.get(
    '/:slug',
    validated({ params: slugParams }, async (_req, res, { params }) => {
      const row = await snapshots.getPublic(params.slug);
      res.json({
        snapshot: {
          slug: row.slug,
          title: row.title,
          caption: row.caption,
          data: row.data as SnapshotData,
          createdAt: row.createdAt.toISOString(),
          svgPath: `/api/public/snapshots/${row.slug}.svg`,
          pngPath: `/api/public/snapshots/${row.slug}.png`,
        },
      } satisfies OrbitReply<'publicSnapshot'>);
    }),
  );
  return router;
}

/** Anyone: the public orbit summary of a spacecraft. */
export function createPublicOrbitRouter({ module }: { module: OrbitModule }) {
  const router = Router();
  router.get('/', async (_req, res) => {
    res.set('cache-control', 'public, max-age=60').json(await module.orbit.publicSummary(null));
  });
  router.get(
    '/:slug',
    validated(
      { params: z.object({ slug: safeText().regex(/^[a-z0-9-]{1,40}$/, { message: 'must be a spacecraft handle' }) }) },
      async (_req, res, { params }) => {
        res.set('cache-control', 'public, max-age=60').json(await module.orbit.publicSummary(params.slug));
      },
    ),
  );
  return router;
}
