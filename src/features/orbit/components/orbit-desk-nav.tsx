import { SectionNav } from '@/components/ui/section-nav';
import type { Spacecraft } from '../types';

const tabs = [
  { to: '/console/orbit', label: 'Trend', end: true },
  { to: '/console/orbit/upload', label: 'Upload' },
  { to: '/console/orbit/history', label: 'History' },
  { to: '/console/orbit/sailing-periods', label: 'Sailing periods' },
  { to: '/console/orbit/snapshots', label: 'Snapshots' },
  { to: '/console/orbit/spacecraft', label: 'Spacecraft' },
];

export function OrbitDeskNav({
  all,
  current,
  onChoose,
}: {
  all: Spacecraft[];
  current: Spacecraft | null;
  onChoose: (id: string) => void;
}) {
  return (
    <div className="mb-6 flex flex-wrap items-center justify-between gap-3">
      <SectionNav label="Orbit desk" links={tabs} />
      {all.length > 1 && current && (
        <label className="flex items-center gap-2 text-sm text-foil-300">
          Spacecraft
          <select
            className="rounded-lg border border-foil-700 bg-night-950 px-2 py-1 text-foil-50"
            value={current.id}
            onChange={(e) => onChoose(e.target.value)}
          >
            {all.map((c) => (
              <option key={c.id} value={c.id}>
                {c.isMissionCraft ? `${c.name} (mission craft)` : c.name}
              </option>
            ))}
          </select>
        </label>
      )}
    </div>
  );
}
