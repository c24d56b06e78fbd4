// An upload received by a process whose own worker will preview it is checked in turns while its row is written
// (prepareSetsInTurns, over tleSlices). These tests hold it to the one-piece check (prepareSets) on files with every
// kind of fault, cut into pieces of every size: the same sets, the same errors on the same lines, the same counts.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { prepareSets, prepareSetsInTurns } from '../../server/modules/orbit/ingest.service';
import { tleSlices } from '../../shared/orbit/tle-parse';
import { TERN1 } from '../../shared/orbit/simulate';
import { tern1Set, tleLines } from './orbit-helpers';

const craft = { catalogNumberInt: TERN1.catalogNumberInt, catalogNumber: TERN1.catalogNumber, name: 'Tern-1' };
const OTHER = TERN1.catalogNumberInt + 1;

/** One record of a file: a set of the craft's, another object's, a repeated one, or a line that is none of those. */
const piece = fc.oneof(
  fc.tuple(fc.nat(400), fc.nat(5)).map(([day, no]) => tleLines([tern1Set(day / 4, no + 1)])),
  fc.nat(400).map((day) => tleLines([tern1Set(day / 4, 1, { catalogNumber: String(OTHER).padStart(5, '0'), catalogNumberInt: OTHER })])),
  fc.nat(400).map((day) => ['TERN-1 SPARE', ...tleLines([tern1Set(day / 4, 2)])]),
  fc.nat(400).map((day) => ['0 TERN-1', ...tleLines([tern1Set(day / 4, 3)])]),
  fc.constantFrom([''], ['   '], ['# a comment'], ['A NAME WITH NO SET']),
  // Half a set, and a set with a digit changed (its checksum then fails) or a letter in a number.
  fc.nat(400).map((day) => [tleLines([tern1Set(day / 4, 4)])[0]!]),
  fc.nat(400).map((day) => [tleLines([tern1Set(day / 4, 4)])[1]!]),
  fc.nat(400).map((day) => {
    const [l1, l2] = tleLines([tern1Set(day / 4, 5)]);
    return [l1!, `${l2!.slice(0, 10)}${l2![10] === '7' ? '8' : '7'}${l2!.slice(11)}`];
  }),
  fc.nat(400).map((day) => {
    const [l1, l2] = tleLines([tern1Set(day / 4, 5)]);
    return [l1!, `${l2!.slice(0, 9)}A${l2!.slice(10)}`];
  }),
  // A mean motion that gives no orbit the craft could fly.
  fc.nat(400).map((day) => tleLines([tern1Set(day / 4, 6, { meanMotionRevPerDay: 0.0001 })])),
);

const file = fc
  .tuple(fc.array(piece, { maxLength: 40 }), fc.boolean(), fc.boolean(), fc.boolean())
  .map(([pieces, crlf, bom, lastNewline]) => {
    const body = pieces.flat().join(crlf ? '\r\n' : '\n') + (lastNewline ? '\n' : '');
    return (bom ? '\uFEFF' : '') + body;
  });

describe('an upload checked in turns', () => {
  it('cuts the text only after a line 2, into pieces that join back to the text, with their first line numbers', () => {
    fc.assert(
      fc.property(file, fc.integer({ min: 1, max: 600 }), (text, chars) => {
        const pieces = tleSlices(text, chars);
        expect(pieces.map((p) => p.text).join('')).toBe(text);
        let line = 0;
        for (const [k, p] of pieces.entries()) {
          expect(p.lineOffset).toBe(line);
          line += p.text.split('\n').length - 1;
          if (k < pieces.length - 1) {
            const lines = p.text.split('\n');
            expect(lines.at(-1)).toBe('');
            expect(lines.at(-2)!).toMatch(/^2( |[ \t\r]*$)/);
          }
        }
      }),
      { numRuns: 300 },
    );
  });

  it('finds the same sets, errors (line, field, message) and counts as checking the file in one piece', async () => {
    await fc.assert(
      fc.asyncProperty(file, fc.integer({ min: 1, max: 600 }), async (text, chars) => {
        const whole = prepareSets(text, craft);
        const inTurns = await prepareSetsInTurns(text, craft, chars);
        expect(inTurns).toEqual(whole);
      }),
      { numRuns: 300 },
    );
  });

  it('reports an error on the line it is on when the file is cut into many pieces', async () => {
    const lines = tleLines(Array.from({ length: 300 }, (_, k) => tern1Set(k, 1)));
    // Line 401 is line 1 of set 201: its catalog number gets a letter that is not a catalog number.
    lines[400] = `1 ${'1'}X${lines[400]!.slice(4)}`;
    const text = lines.join('\n') + '\n';
    const inTurns = await prepareSetsInTurns(text, craft, 1000);
    expect(tleSlices(text, 1000).length).toBeGreaterThan(30);
    expect(inTurns.prepared).toHaveLength(299);
    expect(inTurns.invalidCount).toBe(1);
    expect(inTurns.recordCount).toBe(300);
    expect(inTurns.errors[0]).toMatchObject({ line: 401, field: 'catalog number' });
    expect(inTurns.prepared[200]!.sourceLine).toBe(403);
    expect(inTurns).toEqual(prepareSets(text, craft));
  });
});
