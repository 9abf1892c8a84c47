import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { parseProfileCsv, ProfileCsvError, readProfileCsv } from "../../src/terrain/profile-csv.ts";
import { TerrainError } from "../../src/terrain/terrain-error.ts";

describe("surveyed profile CSV", () => {
  it("reproduces every value exactly, in order, without resampling", () => {
    const text = "distance_m,elevation_m,obstruction_m\n0,412.5,0\n37.25,418.125,12\n100.1,405,0.3\n1234.5678,399.99,0\n";
    const p = parseProfileCsv(text, "p.csv");
    expect([...p.d_m]).toEqual([0, 37.25, 100.1, 1234.5678]);
    expect([...p.h_m]).toEqual([412.5, 418.125, 405, 399.99]);
    expect([...p.obstruction_m]).toEqual([0, 12, 0.3, 0]);
    expect(p.hasObstruction).toBe(true);
  });

  it("accepts any column order, CRLF, a BOM, spaces, comments and blank lines; obstruction defaults to 0", () => {
    const text = "\uFEFF# surveyed 2024-05\r\n elevation_m , distance_m\r\n\r\n100,0\r\n# mid\r\n-2.5e1,1e3\r\n";
    const p = parseProfileCsv(text, "p.csv");
    expect([...p.d_m]).toEqual([0, 1000]);
    expect([...p.h_m]).toEqual([100, -25]);
    expect([...p.obstruction_m]).toEqual([0, 0]);
    expect(p.hasObstruction).toBe(false);
  });

  it("reads the optional clutter_class, clutter_height_m and zone columns at any spacing", () => {
    const text = "distance_m,elevation_m,clutter_class,clutter_height_m,zone\n0,5,water,0,sea\n120,6,open,0,coastal\n125.5,9,suburban,10,inland\n900,12,urban,15,inland\n2000,30,dense_urban,22.5,inland\n";
    const p = parseProfileCsv(text, "p.csv");
    expect([...p.d_m]).toEqual([0, 120, 125.5, 900, 2000]);
    expect(p.clutter_class).toEqual(["water", "open", "suburban", "urban", "dense_urban"]);
    expect([...p.clutter_height_m!]).toEqual([0, 0, 10, 15, 22.5]);
    expect(p.zone).toEqual(["sea", "coastal", "inland", "inland", "inland"]);
    const bare = parseProfileCsv("distance_m,elevation_m\n0,1\n5,2\n", "p.csv");
    expect([bare.clutter_class, bare.clutter_height_m, bare.zone]).toEqual([null, null, null]);
  });

  // Each case: file text, then where the error must point. Lines and columns are 1-based.
  it.each([
    { case: "non-numeric elevation", text: "distance_m,elevation_m\n0,100\n50,abc\n", line: 3, column: 2, field: "elevation_m", value: "abc" },
    { case: "non-numeric distance", text: "distance_m,elevation_m\n0,100\n5O,101\n", line: 3, column: 1, field: "distance_m", value: "5O" },
    { case: "hex is not a decimal number", text: "distance_m,elevation_m\n0,0x10\n1,2\n", line: 2, column: 2, field: "elevation_m", value: "0x10" },
    { case: "missing value", text: "distance_m,elevation_m,obstruction_m\n0,100,0\n10,101\n", line: 3, column: 3, field: "obstruction_m", value: "" },
    { case: "decreasing distance", text: "distance_m,elevation_m\n0,1\n10,2\n# note\n9.5,3\n", line: 5, column: 1, field: "distance_m", value: "9.5" },
    { case: "repeated distance", text: "elevation_m,distance_m\n1,0\n2,10\n3,10\n", line: 4, column: 2, field: "distance_m", value: "10" },
    { case: "first distance not 0", text: "distance_m,elevation_m\n5,1\n10,2\n", line: 2, column: 1, field: "distance_m", value: "5" },
    { case: "missing elevation column", text: "distance_m,obstruction_m\n0,1\n", line: 1, column: 3, field: "elevation_m", value: "distance_m,obstruction_m" },
    { case: "unknown column", text: "distance_m,elevation_m,obstruction\n0,1,2\n", line: 1, column: 3, field: "obstruction", value: "obstruction" },
    { case: "duplicate column", text: "distance_m,elevation_m,distance_m\n0,1,0\n", line: 1, column: 3, field: "distance_m", value: "distance_m" },
    { case: "negative obstruction", text: "distance_m,elevation_m,obstruction_m\n0,1,0\n5,1,-2\n", line: 3, column: 3, field: "obstruction_m", value: "-2" },
    { case: "extra value", text: "distance_m,elevation_m\n0,1\n5,1,7\n", line: 3, column: 3, field: "(none)", value: "7" },
    { case: "one row only", text: "# c\ndistance_m,elevation_m\n0,1\n\n", line: 3, column: 1, field: "distance_m", value: "1" },
    { case: "header only", text: "distance_m,elevation_m\n", line: 1, column: 1, field: "distance_m", value: "0" },
    { case: "empty file", text: "\n# nothing\n", line: 1, column: 1, field: "distance_m", value: "" },
    { case: "unknown clutter class", text: "distance_m,elevation_m,clutter_class\n0,1,open\n5,1,forest\n", line: 3, column: 3, field: "clutter_class", value: "forest" },
    { case: "missing clutter class", text: "distance_m,elevation_m,clutter_class\n0,1,\n5,1,open\n", line: 2, column: 3, field: "clutter_class", value: "" },
    { case: "negative clutter height", text: "distance_m,clutter_height_m,elevation_m\n0,0,1\n5,-1,1\n", line: 3, column: 2, field: "clutter_height_m", value: "-1" },
    { case: "non-numeric clutter height", text: "distance_m,elevation_m,clutter_height_m\n0,1,10m\n5,1,0\n", line: 2, column: 3, field: "clutter_height_m", value: "10m" },
    { case: "unknown zone", text: "distance_m,elevation_m,zone\n0,1,inland\n5,1,land\n", line: 3, column: 3, field: "zone", value: "land" },
  ])("$case → line $line, column $column", (c) => {
    let err: unknown;
    try {
      parseProfileCsv(c.text, "links/a-b.csv");
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ProfileCsvError);
    expect(err).toBeInstanceOf(TerrainError);
    const d = (err as ProfileCsvError).detail;
    expect({ path: d.path, line: d.line, column: d.column, field: d.field, value: d.value }).toEqual({
      path: "links/a-b.csv",
      line: c.line,
      column: c.column,
      field: c.field,
      value: c.value,
    });
    expect(d.expected.length).toBeGreaterThan(0);
    expect((err as Error).message).toContain(`links/a-b.csv:${c.line}:${c.column}:`);
    expect((err as Error).message).toContain(`received "${c.value}"; expected ${d.expected}`);
  });

  describe("readProfileCsv", () => {
    const dir = mkdtempSync(join(tmpdir(), "ridgeline-csv-"));
    afterAll(() => rmSync(dir, { recursive: true, force: true }));

    it("reads a file and names it in errors", () => {
      const f = join(dir, "p.csv");
      writeFileSync(f, "distance_m,elevation_m\n0,1\n2,x\n");
      expect(() => readProfileCsv(f, { label: "p.csv" })).toThrow(/^p\.csv:3:2: not a number/);
      writeFileSync(f, "distance_m,elevation_m\n0,1\n2,3\n");
      expect([...readProfileCsv(f).h_m]).toEqual([1, 3]);
    });

    it("a missing file is a TerrainError with the path", () => {
      expect(() => readProfileCsv(join(dir, "none.csv"))).toThrow(TerrainError);
      expect(() => readProfileCsv(join(dir, "none.csv"))).toThrow(/could not be read \(ENOENT\)/);
    });
  });
});
