import { cn } from '@/lib/cn';
import { Spinner } from '@/components/ui/spinner';
import { Alert } from '@/components/ui/alert';
import { errorMessage } from '@/lib/form-errors';
import { useSnapshotChoices } from '../api/get-snapshot-choices';

/** The orbit desk's frozen charts as thumbnails; one radio group, so arrow keys move between them. */
export function SnapshotPicker({ value, onChange }: { value: string; onChange: (id: string) => void }) {
  const snaps = useSnapshotChoices();
  const choices = snaps.data?.snapshots ?? [];
  const tile = (checked: boolean) =>
    cn(
      'flex h-full cursor-pointer flex-col gap-2 rounded-lg border p-2 text-sm',
      'has-[:focus-visible]:outline has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-amber-400',
      checked ? 'border-amber-400 bg-night-800' : 'border-foil-700 hover:border-foil-500',
    );
  return (
    <fieldset>
      <legend className="font-semibold">Chart snapshot</legend>
      <p className="text-sm text-foil-300">
        Charts the engineers froze on the orbit desk. The e-mail carries the chart as a PNG with its caution line.
      </p>
      {snaps.isPending ? (
        <Spinner label="Loading the snapshots…" />
      ) : snaps.isError ? (
        <Alert title="The snapshots could not load">{errorMessage(snaps.error)}</Alert>
      ) : (
        <ul className="mt-2 grid grid-cols-2 gap-2 sm:grid-cols-3" data-testid="snapshot-picker">
          <li>
            <label className={tile(value === '')}>
              <span className="flex items-center gap-2">
                <input type="radio" name="snapshot" value="" checked={value === ''} onChange={() => onChange('')} />
                No chart
              </span>
              <span className="flex aspect-[16/9] items-center justify-center rounded bg-night-900 text-foil-400" aria-hidden="true">
                —
              </span>
            </label>
          </li>
          {choices.map((s) => (
            <li key={s.id}>
              <label className={tile(value === s.id)}>
                <span className="flex items-start gap-2">
                  <input
                    className="mt-1"
                    type="radio"
                    name="snapshot"
                    value={s.id}
                    checked={value === s.id}
                    onChange={() => onChange(s.id)}
                  />
                  <span className="font-semibold break-words">{s.title}</span>
                </span>
                {/* The title beside it names the chart; the thumbnail adds nothing a screen reader needs. */}
                <img
                  src={`/api/orbit/snapshots/${s.id}/chart.svg`}
                  alt=""
                  className="aspect-[16/9] w-full rounded bg-night-900 object-contain"
                  loading="lazy"
                />
              </label>
            </li>
          ))}
        </ul>
      )}
      {!snaps.isPending && !snaps.isError && choices.length === 0 && (
        <p className="mt-2 text-sm text-foil-300">No snapshots yet: an engineer saves one from a chart on the orbit desk.</p>
      )}
    </fieldset>
  );
}
