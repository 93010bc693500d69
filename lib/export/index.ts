export { toGpx } from "./gpx"

export { toCsv, toMarksCsv, csvField, SAMPLE_CSV_COLUMNS } from "./csv"
