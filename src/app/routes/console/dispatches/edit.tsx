import { useEffect, useState } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import { AUDIENCE_LABEL, DISPATCH_STATE_LABEL, audienceKinds, type AudienceKind, type DispatchDetail } from '@shared/schemas/dispatch';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { useDispatch } from '@/features/dispatches/api/get-dispatch';
import { previewMarkdown, useSaveDispatch, useTransitionDispatch } from '@/features/dispatches/api/save-dispatch';
import { useSnapshotChoices } from '@/features/dispatches/api/get-snapshot-choices';
import { SendProgress } from '@/features/dispatches/components/send-progress';
import { SnapshotPicker } from '@/features/dispatches/components/snapshot-picker';
import { HeroImageField } from '@/features/dispatches/components/hero-image-field';
import { useCampaignTiers } from '@/features/dispatches/api/get-tiers';

export function Component() {
  const { id = 'new' } = useParams();
  const q = useDispatch(id);
  if (id !== 'new' && q.isPending) return <Spinner label="Loading the dispatch…" />;
  if (q.isError) return <Alert title="This dispatch could not load">{errorMessage(q.error)}</Alert>;
  return (
    <Editor
      key={id}
      initial={id === 'new' ? null : (q.data?.dispatch ?? null)}
      heroMaxBytes={q.data?.heroLimits.maxBytes ?? DEFAULT_HERO_MAX_BYTES}
    />
  );
}

// The stylesheet has no typography plugin: lists, links and headings of the rendered Markdown get their shape here.
const RENDERED_MARKDOWN =
  '[&_p]:mt-2 [&_ul]:mt-2 [&_ul]:list-disc [&_ul]:pl-6 [&_ol]:mt-2 [&_ol]:list-decimal [&_ol]:pl-6 [&_a]:text-amber-300 [&_a]:underline [&_h2]:mt-4 [&_h2]:text-xl [&_h2]:font-bold [&_h3]:mt-3 [&_h3]:font-bold [&_blockquote]:border-l-2 [&_blockquote]:border-foil-600 [&_blockquote]:pl-3';

// Only shown before the dispatch exists (the server's own limit arrives with the dispatch).
const DEFAULT_HERO_MAX_BYTES = 5 * 1024 * 1024;

function Editor({ initial, heroMaxBytes }: { initial: DispatchDetail | null; heroMaxBytes: number }) {
  useDocumentTitle(initial ? initial.title : 'New dispatch');
  const navigate = useNavigate();
  const [title, setTitle] = useState(initial?.title ?? '');
  const [body, setBody] = useState(initial?.bodyMarkdown ?? '');
  const [kind, setKind] = useState<AudienceKind>(initial?.audience.kind ?? 'everyone');
  const [tierIds, setTierIds] = useState<string[]>(initial?.audience.tierIds ?? []);
  const [chartId, setChartId] = useState(initial?.charts[0]?.snapshotId ?? '');
  const [chartAlt, setChartAlt] = useState(initial?.charts[0]?.alt ?? '');
  const [heroAlt, setHeroAlt] = useState(initial?.heroAlt ?? '');
  const [email, setEmail] = useState(initial?.emailOnPublish ?? false);
  const [publishAt, setPublishAt] = useState('');
  const [preview, setPreview] = useState(initial?.bodyHtml ?? '');
  const save = useSaveDispatch(initial?.id ?? null);
  const move = useTransitionDispatch(initial?.id ?? '');
  const snaps = useSnapshotChoices();
  const tiers = useCampaignTiers();

  // Live preview: the server renders with the same sanitiser the public page and the e-mail use.
  useEffect(() => {
    const ctl = new AbortController();
    const t = setTimeout(() => {
      previewMarkdown(body, ctl.signal)
        .then((r) => setPreview(r.html))
        .catch(() => undefined);
    }, 250);
    return () => {
      clearTimeout(t);
      ctl.abort();
    };
  }, [body]);

  const input = {
    title,
    bodyMarkdown: body,
    audience: { kind, tierIds: kind === 'tiers' ? tierIds : [] },
    charts: chartId ? [{ snapshotId: chartId, alt: chartAlt }] : [],
    emailOnPublish: email,
    heroAlt,
  };
  // The saved chart shows its frozen PNG; a newly picked one shows the orbit desk's drawing until saved.
  const savedChart = initial?.charts.find((c) => c.snapshotId === chartId);
  const pickedChart = (snaps.data?.snapshots ?? []).find((s) => s.id === chartId);
  const chosenChart = savedChart
    ? { src: savedChart.imagePath, caption: savedChart.caption || savedChart.title }
    : pickedChart
      ? { src: `/api/orbit/snapshots/${pickedChart.id}/chart.svg`, caption: pickedChart.caption || pickedChart.title }
      : null;
  const onSave = () =>
    save.mutate(input, { onSuccess: (d) => void (!initial && navigate(`/console/dispatches/${d.id}`, { replace: true })) });

  return (
    <div>
      <PageHeader
        eyebrow="Dispatch desk"
        title={initial ? initial.title : 'New dispatch'}
        description={initial ? DISPATCH_STATE_LABEL[initial.state] : 'Draft'}
      />
      {save.isError && <Alert title="Not saved">{errorMessage(save.error)}</Alert>}
      {move.isError && <Alert title="Not changed">{errorMessage(move.error)}</Alert>}
      <div className="grid gap-6 lg:grid-cols-2">
        <form
          className="space-y-4"
          onSubmit={(e) => {
            e.preventDefault();
            onSave();
          }}
        >
          <TextField label="Title" value={title} onChange={(e) => setTitle(e.target.value)} required maxLength={160} />
          <label className="block">
            <span className="font-semibold">Body (Markdown)</span>
            <textarea
              className="mt-1 h-64 w-full rounded-md border border-foil-700 bg-night-900 p-2 font-mono text-sm"
              value={body}
              onChange={(e) => setBody(e.target.value)}
              aria-describedby="md-hint"
            />
            <span id="md-hint" className="text-sm text-foil-300">
              **bold**, _italic_, [links](https://…), lists. Scripts and unsafe links are removed.
            </span>
          </label>
          <fieldset>
            <legend className="font-semibold">Audience</legend>
            {audienceKinds.map((k) => (
              <label key={k} className="mr-4 inline-flex items-center gap-1">
                <input type="radio" name="audience" value={k} checked={kind === k} onChange={() => setKind(k)} />
                {AUDIENCE_LABEL[k]}
              </label>
            ))}
            {kind === 'tiers' && (
              <div className="mt-2">
                {(tiers.data ?? []).map((t) => (
                  <label key={t.id} className="mr-4 inline-flex items-center gap-1">
                    <input
                      type="checkbox"
                      checked={tierIds.includes(t.id)}
                      onChange={(e) => setTierIds(e.target.checked ? [...tierIds, t.id] : tierIds.filter((x) => x !== t.id))}
                    />
                    {t.title}
                  </label>
                ))}
              </div>
            )}
          </fieldset>
          <SnapshotPicker value={chartId} onChange={setChartId} />
          {chartId && (
            <TextField label="Chart description (alt text)" value={chartAlt} onChange={(e) => setChartAlt(e.target.value)} required />
          )}
          {initial ? (
            <HeroImageField dispatch={initial} maxBytes={heroMaxBytes} alt={heroAlt} onAltChange={setHeroAlt} />
          ) : (
            <p className="rounded-xl border border-foil-800 p-3 text-sm text-foil-300">
              <span className="font-semibold text-foil-100">Hero image:</span> save the draft first, then add an image here.
            </p>
          )}
          <label className="inline-flex items-center gap-2">
            <input type="checkbox" checked={email} onChange={(e) => setEmail(e.target.checked)} />
            E-mail the audience when it is published
          </label>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" loading={save.isPending}>
              Save
            </Button>
            {initial?.allowed.includes('published') && (
              <Button type="button" variant="secondary" loading={move.isPending} onClick={() => move.mutate({ to: 'published' })}>
                Publish now
              </Button>
            )}
            {initial?.allowed.includes('withdrawn') && (
              <Button type="button" variant="danger" onClick={() => move.mutate({ to: 'withdrawn' })}>
                Withdraw
              </Button>
            )}
            {initial?.allowed.includes('draft') && (
              <Button type="button" variant="ghost" onClick={() => move.mutate({ to: 'draft' })}>
                Back to draft
              </Button>
            )}
          </div>
          {initial?.allowed.includes('scheduled') && (
            <div className="flex flex-wrap items-end gap-2">
              <TextField
                label="Publish at (your time)"
                type="datetime-local"
                value={publishAt}
                onChange={(e) => setPublishAt(e.target.value)}
              />
              <Button
                type="button"
                variant="secondary"
                disabled={!publishAt}
                onClick={() => move.mutate({ to: 'scheduled', publishAt: new Date(publishAt).toISOString() })}
              >
                Schedule
              </Button>
            </div>
          )}
        </form>
        <section aria-labelledby="preview-h" className="rounded-xl border border-foil-800 p-4">
          <h2 id="preview-h" className="text-sm font-bold uppercase tracking-wide text-amber-400">
            Preview
          </h2>
          <h3 className="mt-2 text-2xl font-bold">{title || 'Untitled'}</h3>
          {/* Sanitised on the server by the one renderer shared with the public page and the e-mail. */}
          <div className={`prose prose-invert mt-3 max-w-none ${RENDERED_MARKDOWN}`} dangerouslySetInnerHTML={{ __html: preview }} />
          {initial?.heroImagePath && <img src={initial.heroImagePath} alt={heroAlt} className="mt-3 w-full rounded-lg" />}
          {chosenChart && (
            <figure className="mt-4">
              <img src={chosenChart.src} alt={chartAlt} className="w-full rounded-lg bg-night-900" />
              <figcaption className="text-sm text-foil-300">{chosenChart.caption}</figcaption>
            </figure>
          )}
        </section>
      </div>
      {initial && initial.state === 'published' && <SendProgress id={initial.id} />}
    </div>
  );
}
