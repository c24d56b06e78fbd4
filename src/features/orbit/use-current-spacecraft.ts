import { useEffect, useState } from 'react';
import { useSpacecraft } from './api/get-spacecraft';

const KEY = 'lightkeel.orbit.spacecraft';

/** The craft the orbit desk is looking at: the one chosen last time on this device, else the mission craft. */
export function useCurrentSpacecraft() {
  const list = useSpacecraft();
  const [chosen, setChosen] = useState<string | null>(() => (typeof localStorage === 'undefined' ? null : localStorage.getItem(KEY)));
  const all = list.data?.spacecraft ?? [];
  const current = all.find((c) => c.id === chosen) ?? all.find((c) => c.isMissionCraft) ?? all[0] ?? null;
  useEffect(() => {
    if (chosen && typeof localStorage !== 'undefined') localStorage.setItem(KEY, chosen);
  }, [chosen]);
  return { list, all, current, choose: setChosen };
}
