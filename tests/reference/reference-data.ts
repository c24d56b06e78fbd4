// Published verification files, read from ../shared/reference-data beside the repository (CI puts a copy there).
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
export const referenceDataDir = path.resolve(repoRoot, '..', 'shared', 'reference-data');

export function readReferenceFile(name: 'SGP4-VER.TLE' | 'tcppver.out'): string {
  return readFileSync(path.join(referenceDataDir, name), 'utf8');
}

export type VerificationCase = {
  catalogNumber: string;
  line1: string;
  line2: string;
  /** Start, stop, step [min] from the end of line 2. */
  startMin: number;
  stopMin: number;
  stepMin: number;
  /** The `#` comment lines just before the set. */
  comments: string[];
  line1No: number;
};

/** SGP4-VER.TLE (Vallado et al. 2006): each set's line 2 carries start, stop and step after column 69. */
export function readVerificationCases(): VerificationCase[] {
  const lines = readReferenceFile('SGP4-VER.TLE').split(/\r?\n/);
  const cases: VerificationCase[] = [];
  let comments: string[] = [];
  for (let i = 0; i < lines.length; i++) {
    const l = lines[i]!;
    if (l.startsWith('#')) {
      comments.push(l);
      continue;
    }
    if (l.startsWith('1 ')) {
      const l2 = lines[i + 1]!;
      const [startMin, stopMin, stepMin] = l2.slice(69).trim().split(/\s+/).map(Number) as [number, number, number];
      cases.push({ catalogNumber: l.slice(2, 7), line1: l, line2: l2.slice(0, 69), startMin, stopMin, stepMin, comments, line1No: i + 1 });
      comments = [];
      i++;
    }
  }
  return cases;
}

export type ReferenceRow = { minutes: number; r: [number, number, number]; v: [number, number, number] };

/** tcppver.out: blocks start "<catalog> xx"; rows are minutes, x y z [km], vx vy vz [km/s] in TEME. */
export function readReferenceOutput(): { catalogNumber: string; rows: ReferenceRow[] }[] {
  const blocks: { catalogNumber: string; rows: ReferenceRow[] }[] = [];
  for (const line of readReferenceFile('tcppver.out').split(/\r?\n/)) {
    const t = line.trim();
    if (!t) continue;
    if (t.endsWith('xx')) {
      blocks.push({ catalogNumber: t.split(/\s+/)[0]!, rows: [] });
      continue;
    }
    const f = t.split(/\s+/).map(Number);
    blocks[blocks.length - 1]!.rows.push({ minutes: f[0]!, r: [f[1]!, f[2]!, f[3]!], v: [f[4]!, f[5]!, f[6]!] });
  }
  return blocks;
}
