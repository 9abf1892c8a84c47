/**
 * Study keys that were renamed: a study still using the old key gets an error naming the new
 * one. Keyed by the parent's field path pattern (array indices as `*`) and the old key.
 */
const RENAMED: Record<string, Record<string, { key: string; why: string }>> = {
  design: {
    field_margin_db: { key: "design_allowance_db", why: "the allowance for ageing, misalignment and the like is now called the design allowance" },
  },
};

/** The new name of `key` under the field at `path`, or null when it was never renamed. */
export function renamedKey(path: readonly PropertyKey[], key: string): { key: string; why: string } | null {
  const pattern = path.map((p) => (typeof p === "number" ? "*" : String(p))).join(".");
  return RENAMED[pattern]?.[key] ?? null;
}
