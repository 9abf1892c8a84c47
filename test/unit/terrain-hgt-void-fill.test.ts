import fc from "fast-check";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { openHgt } from "../../src/terrain/hgt.ts";
import { fillHgtVoids, HGT_VOID } from "../../src/terrain/hgt-void-fill.ts";
import { writeHgtTile } from "../../src/terrain/write-hgt.ts";
import { expectClose } from "../helpers/expect-close.ts";

const V = HGT_VOID;
const grid = (rows: number[][]): Int16Array => Int16Array.from(rows.flat());

describe("fillHgtVoids (IDW of nearest valid samples along row and column)", () => {
  it("returns null for a tile without voids and leaves the input untouched", () => {
    const src = grid([[1, 2], [3, 4]]);
    expect(fillHgtVoids(src, 2)).toBeNull();
    expect([...src]).toEqual([1, 2, 3, 4]);
  });

  it("fills a lone void in a plane exactly (four neighbours at d = 1)", () => {
    // h = 10 r + 3 c
    const rows = [0, 1, 2, 3, 4].map((r) => [0, 1, 2, 3, 4].map((c) => 10 * r + 3 * c));
    rows[2][2] = V;
    const src = grid(rows);
    const f = fillHgtVoids(src, 5)!;
    expect(f.data[2 * 5 + 2]).toBe(26);
    expect([f.voids, f.unfilled, f.voidMask[12], f.voidMask[11]]).toEqual([1, 0, 1, 0]);
    expect(src[12]).toBe(V); // input not mutated
  });

  it("weights by inverse distance: void at distances 1 (left), 2 (right), 1 (up), 1 (down)", () => {
    const src = grid([
      [0, 50, 0, 0],
      [10, V, V, 40],
      [0, 70, 0, 0],
      [0, 0, 0, 0],
    ]);
    const f = fillHgtVoids(src, 4)!;
    // (1·10 + ½·40 + 1·50 + 1·70) / (1 + ½ + 1 + 1) = 150 / 3.5
    expectClose(f.data[5], 150 / 3.5, { abs: 1e-4 }, "void (1,1)"); // Float32 storage
    // (1/2)·10 + 1·40 + 1·0 + 1·0 over 3.5
    expectClose(f.data[6], 45 / 3.5, { abs: 1e-4 }, "void (1,2)");
  });

  it("leaves a void NaN when no direction reaches a valid sample, and counts it", () => {
    const f = fillHgtVoids(grid([[V, V], [V, V]]), 2)!;
    expect([...f.data].every(Number.isNaN)).toBe(true);
    expect([f.voids, f.unfilled]).toEqual([4, 4]);
  });

  it("every filled value lies between the smallest and largest valid sample (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 9 }).chain((n) => fc.tuple(fc.constant(n), fc.array(fc.oneof(fc.integer({ min: -500, max: 4000 }), fc.constant(V)), { minLength: n * n, maxLength: n * n }))), ([n, vals]) => {
        const src = Int16Array.from(vals);
        const f = fillHgtVoids(src, n);
        const valid = vals.filter((v) => v !== V);
        if (f === null) return valid.length === vals.length;
        const lo = Math.min(...valid);
        const hi = Math.max(...valid);
        return [...f.data].every((h, i) => (vals[i] === V ? Number.isNaN(h) || (h >= lo - 1e-3 && h <= hi + 1e-3) : h === vals[i]));
      }),
    );
  });
});

describe("voids in an SRTM tile", () => {
  const dir = mkdtempSync(join(tmpdir(), "ridgeline-void-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  // 3″ tile, h = 1000 + r − c (r, c sample indices from the NW corner), voids at (600, 600) and a 3×3 block at rows 100–102, cols 200–202.
  const s = 1 / 1200;
  const isVoid = (r: number, c: number): boolean => (r === 600 && c === 600) || (r >= 100 && r <= 102 && c >= 200 && c <= 202);
  writeHgtTile(join(dir, "N10E020.hgt"), 10, 20, 3, (lat, lon) => {
    const r = Math.round((11 - lat) * 1200);
    const c = Math.round((lon - 20) * 1200);
    return isVoid(r, c) ? NaN : 1000 + r - c;
  });
  const t = openHgt(dir);
  const at = (r: number, c: number): [number, number] => [11 - r * s, 20 + c * s];

  it("gives a finite value between the neighbours at a filled void", () => {
    const h = t.elevation(...at(600, 600));
    expectClose(h, 1000, { abs: 1e-9 }, "lone void in a plane is filled exactly");
    const hb = t.elevation(...at(101, 201));
    // neighbours along row/column: 1000+101−199=902, 1000+101−203=898, 1000+99−201=898, 1000+103−201=902
    expect(hb).toBeGreaterThanOrEqual(898);
    expect(hb).toBeLessThanOrEqual(902);
  });

  it("counts samples whose bilinear cell uses a filled void", () => {
    const pts = [
      at(600.5, 600.5), // cell with the void as NW corner → counted
      at(598.5, 598.5), // two cells away → not counted
      at(600, 602), // exactly on a valid sample: only that sample has weight → not counted
      at(600, 600), // exactly on the void → counted
      at(100.5, 199.5), // cell touching the block's corner (100, 200) → counted
      at(99.25, 199.25), // cell (99–100, 199–200) touches (100, 200) with weight > 0 → counted
    ];
    const res = t.sample(pts.map((p) => p[0]), pts.map((p) => p[1]));
    expect(res.voidFilled).toBe(4);
    expect(res.outside).toBe(0);
    expect([...res.h_m].every(Number.isFinite)).toBe(true);
  });
});
