export { toGpx, GPX_NAMESPACE, STRAIGHTAWAY_GPX_NAMESPACE } from "./gpx"
export type { GpxMeta } from "./gpx"
export { toCsv, toMarksCsv, csvField, SAMPLE_CSV_COLUMNS, MARK_CSV_COLUMNS } from "./csv"
