/**
 * The workbook's piece test for IRR roots (lib/export/sheet-irr-grid.ts):
 * where it decides, it gives the full grid scan's count, and the piece it
 * names holds the root.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { scanIrrRoots } from '@/lib/engine';
import { IRR_PIECES, edgeStep, pieceTest, vincentMatrix } from '@/lib/export/sheet-irr-grid';

const rate = (k: number) => (k - 990) / 1000;

describe('IRR piece test of the workbook', () => {
  it('finds the one root of a textbook example in its piece', () => {
    // Wikipedia, "Internal rate of return", example: −123,400, 36,200, 54,800, 48,100 → IRR 5.96 %
    const d = [-123400, 36200, 54800, 48100];
    expect(pieceTest(d)).toEqual({ count: 1, piece: 4 });
    expect(rate(edgeStep(3))).toBeLessThan(0.0596);
    expect(rate(edgeStep(4))).toBeGreaterThan(0.0596);
  });

  it('leaves two roots in one piece to the grid scan', () => {
    // −100 + 230/(1+i) − 132/(1+i)² = 0 at i = 10 % and 20 % (the usual two-IRR example, from memory)
    expect(pieceTest([-100, 230, -132])).toEqual({ count: -1, piece: '' });
    expect(scanIrrRoots([-100, 230, -132])).toHaveLength(2);
  });

  it('gives no root for flows of one sign and counts on the grid when ΔCF is all zero', () => {
    expect(pieceTest([-5, -1, -2])).toEqual({ count: 0, piece: '' });
    expect(pieceTest([0, 0, 0])).toEqual({ count: -1, piece: '' });
  });

  it('pieces tile the grid and each matrix maps t = 0 and t → ∞ to the piece ends', () => {
    expect(edgeStep(0)).toBe(0);
    expect(edgeStep(IRR_PIECES)).toBe(10990);
    // row 0 of M is f at the piece's high-rate end, row N is f at its low-rate end (t^N coefficient)
    const d = [-3, 1, 2.5];
    const m = vincentMatrix(2, 5);
    const f = (i: number) => d.reduce((s, v, y) => s + v / (1 + i) ** y, 0);
    const at = (row: number[]) => row.reduce((s, c, y) => s + c * d[y], 0);
    expect(at(m[0])).toBeCloseTo(f(rate(edgeStep(6))), 9);
    expect(at(m[2])).toBeCloseTo(f(rate(edgeStep(5))), 9);
  });

  it('where it decides, its count is the full scan\'s, and its piece holds the root', () => {
    // flows are 0 or money of at least a millionth of a unit: a difference of two policies' flows in the
    // ±1e6 range is 0 or above 1e-10 in size, never subnormal (at 1e-323 every npv is rounding noise
    // and the full scan counts dozens of sign changes that no real case has)
    const amount = fc.tuple(fc.boolean(), fc.double({ min: 1e-6, max: 1e6, noNaN: true })).map(([neg, v]) => (neg ? -v : v));
    const flows = fc.array(fc.oneof(fc.constant(0), amount), { minLength: 2, maxLength: 16 });
    let decided = 0;
    fc.assert(
      fc.property(flows, (d) => {
        const t = pieceTest(d);
        if (t.count < 0) return;
        decided++;
        const roots = scanIrrRoots(d);
        expect(t.count).toBe(roots.length);
        if (typeof t.piece === 'number' && t.piece > 0) {
          expect(roots[0].lo).toBeGreaterThanOrEqual(rate(edgeStep(t.piece - 1)));
          expect(roots[0].hi).toBeLessThanOrEqual(rate(edgeStep(t.piece)));
        }
      }),
      { numRuns: 400 },
    );
    expect(decided).toBeGreaterThan(100);
  });
});
