// Sky watch: visible passes for 10 days at one place, against a bare 1-second satellite.js loop over the same
// span that finds the same passes (elevation every second; Sun and shadow only while the craft is above 10°).
import { ecfToLookAngles, eciToEcf, gstime, propagate } from 'satellite.js';
import { findVisiblePasses, isSunlit, sunAltitudeDeg, type Observer } from '../../shared/orbit/passes';
import { createSatrec } from '../../shared/orbit/sgp4-altitude';
import { simulateTern1 } from '../../shared/orbit/simulate';
import { writeTle } from '../../shared/orbit/tle-write';
import { median, type Benchmark } from './harness';

function bareLoop(satrec: ReturnType<typeof createSatrec>, o: Observer, fromMs: number, toMs: number) {
  const geo = { latitude: (o.latitudeDeg * Math.PI) / 180, longitude: (o.longitudeDeg * Math.PI) / 180, height: 0 };
  const starts: number[] = [];
  let inPass = false;
  for (let t = fromMs; t <= toMs; t += 1000) {
    const d = new Date(t);
    const pv = propagate(satrec, d);
    let vis = false;
    if (pv) {
      const el = (ecfToLookAngles(geo, eciToEcf(pv.position, gstime(d))).elevation * 180) / Math.PI;
      vis = el > 10 && sunAltitudeDeg(o, t) < -6 && isSunlit(satrec, t);
    }
    if (vis && !inPass) starts.push(t);
    inPass = vis;
  }
  return starts;
}

export const benchmarks: Benchmark[] = [
  {
    id: 'sky-watch.passes',
    goal: 0.05,
    better: 'lower',
    run: async ({ log }) => {
      const sets = simulateTern1().sets;
      const last = sets[sets.length - 1]!;
      const satrec = createSatrec(writeTle(last));
      // Tern-1's newest simulated set (late November) seen from a southern mid-latitude site, where its orbit gives
      // visible passes in the evening and morning twilight.
      const observer = { latitudeDeg: -41.3, longitudeDeg: 174.8 };
      const fromMs = last.epochMs,
        toMs = fromMs + 10 * 86_400_000;
      const oursTimes: number[] = [],
        bareTimes: number[] = [],
        ratios: number[] = [];
      let ours = findVisiblePasses({ satrec, observer, fromMs, toMs });
      let bare = bareLoop(satrec, observer, fromMs, toMs);
      for (let k = 0; k < 5; k++) {
        let t = performance.now();
        ours = findVisiblePasses({ satrec, observer, fromMs, toMs });
        oursTimes.push(performance.now() - t);
        t = performance.now();
        bare = bareLoop(satrec, observer, fromMs, toMs);
        bareTimes.push(performance.now() - t);
        ratios.push(oursTimes[k]! / bareTimes[k]!);
        log(`round ${k + 1}: ours ${oursTimes[k]!.toFixed(1)} ms, bare ${bareTimes[k]!.toFixed(0)} ms`);
      }
      const same = ours.length === bare.length && ours.every((p, i) => Math.abs(p.start.atMs - bare[i]!) <= 1000);
      if (!same) throw new Error(`the two searches disagree: ours ${ours.length} passes, the 1-second loop ${bare.length}`);
      return {
        ratio: median(ratios),
        detail: `10 days at one place, ${ours.length} visible passes found by both (starts within 1 s): ours ${median(oursTimes).toFixed(1)} ms vs 1-second loop ${median(bareTimes).toFixed(0)} ms (median of 5 alternating rounds after a warm-up)`,
      };
    },
  },
];
