import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { ProgressBar } from '@/components/ui/progress-bar';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { cn } from '@/lib/cn';
import { errorMessage } from '@/lib/form-errors';
import { startUpload } from '../api/start-upload';
import { useUpload } from '../api/get-upload';
import { useFinishUpload } from '../api/finish-upload';
import { orbitKeys } from '../api/keys';
import { countOf, formatUtcDateTime } from '../format';
import type { Spacecraft, Upload } from '../types';

const kb = (n: number) => (n >= 1024 * 1024 ? `${(n / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(n / 1024))} KB`);

/** The other objects an upload's errors name, once each. */
function otherObjects(errors: Upload['errors']) {
  const seen = new Map<string, NonNullable<Upload['errors'][number]['object']>>();
  for (const e of errors) if (e.object && !seen.has(e.object.catalogNumber)) seen.set(e.object.catalogNumber, e.object);
  return [...seen.values()];
}

const slugOf = (name: string) =>
  name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40) || 'object';

/** What the worker has done so far; before it starts, the upload waits in the queue (held, nothing lost). */
function WorkProgress({ upload }: { upload: Upload }) {
  const { processed, total } = upload.progress;
  const parsing = upload.status === 'parsing';
  const waiting = total === 0;
  const percent = total > 0 ? Math.floor((processed / total) * 100) : 0;
  const counted = `${processed.toLocaleString('en-GB')} of ${countOf(total, 'set')}`;
  const text = waiting
    ? parsing
      ? 'Waiting for a worker to read the file — it is stored and will not be lost'
      : 'Waiting for a worker to start the import'
    : !parsing && processed >= total
      ? `Importing — all ${countOf(total, 'set')} sent to the database; storing them and updating the outlier flags`
      : `${parsing ? 'Checking the sets' : 'Importing'} — ${counted} (${percent} %)`;
  return (
    <div className="mb-4 space-y-1.5" data-testid="upload-progress">
      <p className="text-sm text-foil-200">{text}</p>
      <ProgressBar
        label={parsing ? 'Checking the file' : 'Importing the sets'}
        value={processed}
        max={total || 1}
        valueText={waiting ? 'waiting for a worker' : `${counted}, ${percent} %`}
      />
    </div>
  );
}

export function UploadPanel({ craft }: { craft: Spacecraft }) {
  const queryClient = useQueryClient();
  const fileInput = useRef<HTMLInputElement>(null);
  const [dragging, setDragging] = useState(false);
  const [pasted, setPasted] = useState('');
  const [sending, setSending] = useState<{ name: string; sent: number; total: number } | null>(null);
  const [sendError, setSendError] = useState<string | null>(null);
  const [jobId, setJobId] = useState<string | null>(null);
  const job = useUpload(jobId);
  const finish = useFinishUpload();
  const upload = job.data?.upload;

  async function send(input: { file?: File; text?: string }) {
    setSendError(null);
    setJobId(null);
    finish.reset();
    const name = input.file?.name ?? 'pasted lines';
    setSending({ name, sent: 0, total: input.file?.size ?? new Blob([input.text ?? '']).size });
    try {
      const res = await startUpload({ spacecraftId: craft.id, ...input, onProgress: (sent, total) => setSending({ name, sent, total }) });
      queryClient.setQueryData(orbitKeys.upload(res.upload.id), res);
      setJobId(res.upload.id);
    } catch (e) {
      setSendError(errorMessage(e));
    } finally {
      setSending(null);
    }
  }

  const done = upload?.status === 'imported';
  useEffect(() => {
    if (done) void queryClient.invalidateQueries({ queryKey: orbitKeys.craft(craft.id) });
  }, [done, craft.id, queryClient]);

  return (
    <div className="space-y-6">
      <Card>
        <CardHeader
          level={2}
          title="Add element sets"
          description={`Two-/three-line sets or CCSDS OMM (KVN, XML, JSON, CSV) for ${craft.name} (catalog ${craft.catalogNumber}). Nothing is stored until you import.`}
        />
        <div
          data-testid="drop-zone"
          onDragOver={(e) => {
            e.preventDefault();
            setDragging(true);
          }}
          onDragLeave={() => setDragging(false)}
          onDrop={(e) => {
            e.preventDefault();
            setDragging(false);
            const f = e.dataTransfer.files[0];
            if (f) void send({ file: f });
          }}
          className={cn(
            'flex flex-col items-center justify-center gap-3 rounded-xl border-2 border-dashed px-4 py-10 text-center transition-colors',
            dragging ? 'border-amber-400 bg-amber-950/20' : 'border-foil-700',
          )}
        >
          <p className="font-semibold text-foil-100">Drop a file here</p>
          <p className="text-sm text-foil-400">or</p>
          <Button variant="secondary" onClick={() => fileInput.current?.click()} disabled={!!sending}>
            Choose a file…
          </Button>
          <input
            ref={fileInput}
            type="file"
            className="sr-only"
            aria-label="Element-set file"
            accept=".tle,.txt,.3le,.2le,.kvn,.xml,.json,.csv,text/plain"
            onChange={(e) => {
              const f = e.target.files?.[0];
              if (f) void send({ file: f });
              e.target.value = '';
            }}
          />
        </div>
        <form
          className="mt-5 space-y-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (pasted.trim()) void send({ text: pasted });
          }}
        >
          <label htmlFor="paste-sets" className="block text-sm font-semibold text-foil-100">
            Or paste a few lines
          </label>
          <textarea
            id="paste-sets"
            rows={4}
            value={pasted}
            onChange={(e) => setPasted(e.target.value)}
            spellCheck={false}
            className="block w-full rounded-lg border border-foil-700 bg-night-950/60 px-3 py-2 font-mono text-xs text-foil-50 focus:border-amber-400"
            placeholder={
              '1 99871U 25951C   26100.50000000  .00000251  00000-0  21652-2 0  9996\n2 99871  98.5185 140.2960 0002078  89.0691 271.5623 14.32664354 12045'
            }
          />
          <Button type="submit" variant="secondary" disabled={!pasted.trim() || !!sending}>
            Preview pasted lines
          </Button>
        </form>
        {sending && (
          <div className="mt-5 space-y-1.5">
            <p className="text-sm text-foil-200">
              Uploading {sending.name} — {kb(sending.sent)} of {kb(sending.total)}
            </p>
            <ProgressBar
              label="Upload"
              value={sending.sent}
              max={sending.total || 1}
              valueText={`${kb(sending.sent)} of ${kb(sending.total)}`}
            />
          </div>
        )}
        {sendError && (
          <Alert className="mt-5" title="The file was not accepted">
            {sendError}
          </Alert>
        )}
      </Card>

      {upload && (
        <Card data-testid="upload-preview">
          <CardHeader
            level={2}
            title={
              upload.status === 'imported' ? 'Imported' : upload.status === 'cancelled' ? 'Cancelled' : `Preview of ${upload.filename}`
            }
            description={`${kb(upload.byteSize)} · ${upload.format ?? 'unknown format'}`}
            actions={
              <Badge tone={upload.status === 'imported' ? 'good' : upload.status === 'failed' ? 'attention' : 'neutral'}>
                {upload.status}
              </Badge>
            }
          />
          {(upload.status === 'parsing' || upload.status === 'importing') && <WorkProgress upload={upload} />}
          {upload.status !== 'parsing' && (
            <>
              <dl className="grid grid-cols-3 gap-2 text-center" data-testid="upload-counts">
                <div className="rounded-xl border border-emerald-400/40 px-2 py-3">
                  <dt className="text-xs uppercase tracking-wide text-foil-400">New</dt>
                  <dd className="text-2xl font-bold tabular-nums text-emerald-200">{upload.counts.new.toLocaleString('en-GB')}</dd>
                </div>
                <div className="rounded-xl border border-foil-600 px-2 py-3">
                  <dt className="text-xs uppercase tracking-wide text-foil-400">Duplicate</dt>
                  <dd className="text-2xl font-bold tabular-nums text-foil-100">{upload.counts.duplicate.toLocaleString('en-GB')}</dd>
                </div>
                <div className="rounded-xl border border-red-400/40 px-2 py-3">
                  <dt className="text-xs uppercase tracking-wide text-foil-400">Invalid</dt>
                  <dd className="text-2xl font-bold tabular-nums text-red-200">{upload.counts.invalid.toLocaleString('en-GB')}</dd>
                </div>
              </dl>
              {upload.message && (
                <p className="mt-3 text-sm text-foil-200" data-testid="upload-message">
                  {upload.message}
                </p>
              )}
              {upload.existingFile && (
                <p className="mt-1 text-sm text-amber-200">
                  This exact file was already uploaded as “{upload.existingFile.filename}” on{' '}
                  {formatUtcDateTime(Date.parse(upload.existingFile.uploadedAt))}.
                </p>
              )}
              {upload.errors.length > 0 && (
                <Table className="mt-4" caption="First errors">
                  <THead>
                    <tr>
                      <Th>Line</Th>
                      <Th>Field</Th>
                      <Th>Problem</Th>
                    </tr>
                  </THead>
                  <TBody>
                    {upload.errors.slice(0, 12).map((e, i) => (
                      <Tr key={i}>
                        <Td className="tabular-nums">
                          {e.line}
                          {e.columns ? `:${e.columns[0]}–${e.columns[1]}` : ''}
                        </Td>
                        <Td>{e.field ?? '—'}</Td>
                        <Td>
                          {e.message}
                          {e.expected ? <span className="text-foil-400"> (expected {e.expected})</span> : null}
                        </Td>
                      </Tr>
                    ))}
                  </TBody>
                </Table>
              )}
              {otherObjects(upload.errors).map((o) => (
                <Alert key={o.catalogNumber} tone="info" className="mt-4" title={`Sets of another object: catalog ${o.catalogNumber}`}>
                  <p>
                    {o.name ? `“${o.name}”` : 'This object'} is not {craft.name}. Keep it on the desk as a comparison object, then upload
                    the file again for it.
                  </p>
                  <Link
                    className="mt-2 inline-block font-semibold text-amber-300 underline"
                    to={`/console/orbit/spacecraft?${new URLSearchParams({
                      add: '1',
                      name: o.name ?? `Object ${o.catalogNumber}`,
                      slug: slugOf(o.name ?? `object-${o.catalogNumber}`),
                      catalogNumber: o.catalogNumber,
                      internationalDesignator: o.internationalDesignator,
                      sailAreaM2: '0',
                    }).toString()}`}
                  >
                    Add this object as a spacecraft
                  </Link>
                </Alert>
              ))}
              {upload.errors.length > 12 && (
                <p className="mt-2 text-xs text-foil-400">…and more; {upload.counts.invalid} invalid records in all.</p>
              )}
            </>
          )}
          {upload.status === 'previewed' && (
            <div className="mt-5 flex flex-wrap gap-3">
              <Button
                onClick={() => finish.mutate({ jobId: upload.id, action: 'import' })}
                loading={finish.isPending}
                disabled={upload.counts.new === 0 && upload.counts.duplicate === 0}
              >
                {upload.counts.new > 0 ? `Import ${countOf(upload.counts.new, 'new set')}` : 'Import'}
              </Button>
              <Button variant="ghost" onClick={() => finish.mutate({ jobId: upload.id, action: 'cancel' })} disabled={finish.isPending}>
                Cancel
              </Button>
            </div>
          )}
          {finish.isError && (
            <Alert className="mt-4" title="That did not work">
              {errorMessage(finish.error)}
            </Alert>
          )}
          {done && (
            <p className="mt-4 text-sm">
              <Link to="/console/orbit" className="font-semibold text-amber-300 underline">
                See the trend
              </Link>
              {' · '}
              <Link to="/console/orbit/history" className="font-semibold text-amber-300 underline">
                Open the history
              </Link>
            </p>
          )}
        </Card>
      )}
    </div>
  );
}
