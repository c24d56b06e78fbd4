// Orbit engine benchmarks, each against a bare loop doing the same work on the same inputs in the same run.
import { deriveElementSet, formatTleFile, meanMotionForSemiMajorAxis, parseElementSets, type TleWriteInput } from '../../shared/orbit';
import { median, type Benchmark } from './harness';

/**
 * Alternates ours and the baseline `rounds` times after a warm-up of each, so machine load drifts hit both
 * alike; the ratio is the median of the per-round ratios.
 */
async function interleaved(ours: () => void, bare: () => void, rounds = 7): Promise<{ ratio: number; oursMs: number; bareMs: number }> {
  ours();
  bare();
  const o: number[] = [],
    b: number[] = [],
    r: number[] = [];
  for (let k = 0; k < rounds; k++) {
    let t = performance.now();
    ours();
    o.push(performance.now() - t);
    t = performance.now();
    bare();
    b.push(performance.now() - t);
    r.push(o[k]! / b[k]!);
    await new Promise((resolve) => setImmediate(resolve));
  }
  return { ratio: median(r), oursMs: median(o), bareMs: median(b) };
}

export function makeSets(count: number): TleWriteInput[] {
  const t0 = Date.UTC(2025, 0, 1);
  const out: TleWriteInput[] = [];
  for (let k = 0; k < count; k++) {
    const altitudeKm = 400 + (k % 600);
    const e = 0.0005 + (k % 50) * 0.0004;
    const i = 20 + (k % 80);
    out.push({
      catalogNumber: String(10_000 + (k % 90_000)).padStart(5, '0'),
      classification: 'U',
      internationalDesignator: '25001A',
      epochMs: t0 + k * 600_000,
      meanMotionRevPerDay: meanMotionForSemiMajorAxis(6378.135 + altitudeKm, e, i),
      meanMotionDotRevPerDay2: 1e-6 * (k % 7),
      meanMotionDdotRevPerDay3: 0,
      bstar: 1e-4 * (1 + (k % 9)),
      inclinationDeg: i,
      raanDeg: (k * 7.3) % 360,
      eccentricity: e,
      argPerigeeDeg: (k * 13.1) % 360,
      meanAnomalyDeg: (k * 29.7) % 360,
      elementSetNo: k % 9999,
      revAtEpoch: k % 99_999,
    });
  }
  return out;
}

let sink = 0;

/**
 * The bare baseline of orbit.parse: split the text into lines and read each field of a two-line set by slicing its
 * columns and `Number`, with no validation, no checksum, no error reporting and no ISO date — the least work that
 * turns the same text into the same numbers (the published fixed columns of the two-line format).
 */
export function bareParseTle(text: string) {
  const lines = text.split('\n');
  const out = [];
  for (let i = 0; i + 1 < lines.length; i += 2) {
    const l1 = lines[i]!,
      l2 = lines[i + 1]!;
    const yy = Number(l1.slice(18, 20));
    out.push({
      catalogNumber: l1.slice(2, 7),
      catalogNumberInt: Number(l1.slice(2, 7)),
      classification: l1[7],
      internationalDesignator: l1.slice(9, 17).trim(),
      epochMs: Date.UTC(yy < 57 ? 2000 + yy : 1900 + yy, 0, 1) + (Number(l1.slice(20, 32)) - 1) * 86_400_000,
      meanMotionDotRevPerDay2: Number(l1.slice(33, 43)),
      meanMotionDdotRevPerDay3: Number(`${l1[44]}.${l1.slice(45, 50)}e${l1.slice(50, 52)}`),
      bstar: Number(`${l1[53]}.${l1.slice(54, 59)}e${l1.slice(59, 61)}`),
      ephemerisType: Number(l1[62]),
      elementSetNo: Number(l1.slice(64, 68)),
      inclinationDeg: Number(l2.slice(8, 16)),
      raanDeg: Number(l2.slice(17, 25)),
      eccentricity: Number(`.${l2.slice(26, 33)}`),
      argPerigeeDeg: Number(l2.slice(34, 42)),
      meanAnomalyDeg: Number(l2.slice(43, 51)),
      meanMotionRevPerDay: Number(l2.slice(52, 63)),
      revAtEpoch: Number(l2.slice(63, 68)),
      line1: l1,
      line2: l2,
    });
  }
  return out;
}

export const benchmarks: Benchmark[] = [
  {
    id: 'orbit.parse',
    goal: 2,
    better: 'lower',
    async run() {
      const text = formatTleFile(makeSets(100_000));
      const m = await interleaved(
        () => {
          const r = parseElementSets(text);
          for (const s of r.records) sink += deriveElementSet(s).semiMajorAxisKm;
          if (r.records.length !== 100_000) throw new Error(`parsed ${r.records.length}`);
        },
        () => {
          const r = bareParseTle(text);
          for (const s of r) sink += deriveElementSet(s).semiMajorAxisKm;
          if (r.length !== 100_000) throw new Error(`bare parsed ${r.length}`);
        },
      );
      return {
        ratio: m.ratio,
        detail: `text → records → derive: ours ${m.oursMs.toFixed(0)} ms (validation, checksums, errors, ISO dates) vs bare slice+Number ${m.bareMs.toFixed(0)} ms (100k sets, split timed on both sides, median of 7 alternating rounds)`,
      };
    },
  },
];

export function benchSink(): number {
  return sink;
}
