// Moved to src/format/quantity.ts, the one home for writing quantities; re-exported so that
// imports of this path keep working.
export { formatDuration, formatNumber, formatSmall } from "../format/quantity.ts";
