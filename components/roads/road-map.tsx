// The hex map: the shop's cells drawn from their H3 corners around the shop, coloured by qualifying share
// (with the words in the legend and each cell's figures in its title), the best loops' tracks, the shop,
// a north mark and a scale bar. Plain SVG drawn on the server: no tiles, no map library in the browser.
import type { RoadsView } from "@/app/_server/roads"
import { formatDuration, formatSpeedMph } from "@/lib/format"
import { SHARE_CLASSES, createProjection, niceScale, shareClass, type ShareClass } from "@/lib/roads/model"

const SHARE_FILL: Record<ShareClass, string> = { most: "#f5a30a", often: "#ffbf3d", some: "#ffd27a", rare: "#9aa0a8" }
const SHARE_OPACITY: Record<ShareClass, number> = { most: 0.95, often: 0.75, some: 0.6, rare: 0.45 }
export const LOOP_STROKE = ["#0b5f58", "#14a89a", "#6d28d9"] as const
const LOOP_DASH = ["", "10 6", "3 5"] as const

const SIZE = 1000

export function RoadMap({ view }: { view: RoadsView }) {
  const home = view.location
  if (!home) return null
  const project = createProjection(home)
  const cells = view.cells.map((c) => ({ ...c, points: c.corners.map(([lat, lon]) => project(lat, lon)) }))
  const tracks = view.loops.map((l) => l.track.map(([lat, lon]) => project(lat, lon)))
  let extent = 1500
  for (const c of cells) for (const [x, y] of c.points) extent = Math.max(extent, Math.abs(x), Math.abs(y))
  for (const t of tracks) for (const [x, y] of t) extent = Math.max(extent, Math.abs(x), Math.abs(y))
  extent *= 1.08
  const k = SIZE / (2 * extent)
  // whole units of a 1000-unit map: a shared corner rounds the same way for both its cells, and the page stays small
  const px = ([x, y]: [number, number]) => `${Math.round((x + extent) * k)},${Math.round((y + extent) * k)}`
  const scale = niceScale(extent * 0.5, view.units)
  const unitM = view.units === "imperial" ? 1609.344 : 1000
  const unitWord = view.units === "imperial" ? "mi" : "km"
  return (
    <figure className="space-y-3">
      <svg
        viewBox={`0 0 ${SIZE} ${SIZE}`}
        className="aspect-square w-full rounded-lg border border-graphite-200 bg-graphite-50 dark:border-asphalt-700 dark:bg-asphalt-900"
        role="img"
        aria-labelledby="road-map-title"
        data-testid="road-map"
      >
        <title id="road-map-title">
          {`Hex map of ${cells.length} road cells around the shop, coloured by the share of driving at qualifying speed, with the tracks of the ${view.loops.length} best loops.`}
        </title>
        <g data-testid="road-cells" stroke="#ffffff" strokeWidth={0.8}>
          {cells.map((c) => {
            const cls = shareClass(c.qualifyingShare)
            return (
              <polygon
                key={c.cell}
                points={c.points.map(px).join(" ")}
                fill={SHARE_FILL[cls]}
                fillOpacity={SHARE_OPACITY[cls]}
                data-share={cls}
              >
                <title>
                  {`${Math.round(c.qualifyingShare * 100)} % qualifying, ${Math.round(c.followingShare * 100)} % following, median ${formatSpeedMph(c.medianSpeedMph, view.units)}, ${formatDuration(c.minutes * 60)} driven, ${c.harshPerHour.toFixed(1)} harsh events an hour`}
                </title>
              </polygon>
            )
          })}
        </g>
        <g fill="none" strokeLinejoin="round" strokeLinecap="round" data-testid="road-loop-tracks">
          {tracks.map((t, i) =>
            t.length > 1 ? (
              <polyline
                key={i}
                points={t.map(px).join(" ")}
                stroke={LOOP_STROKE[i]}
                strokeWidth={5}
                strokeDasharray={LOOP_DASH[i]}
              />
            ) : null,
          )}
          {tracks.map((t, i) => {
            const far = t.reduce((f, p) => (p[0] ** 2 + p[1] ** 2 > f[0] ** 2 + f[1] ** 2 ? p : f), t[0] ?? [0, 0])
            const [x, y] = px(far).split(",").map(Number)
            return (
              <g key={`n${i}`}>
                <circle cx={x} cy={y} r={22} fill={LOOP_STROKE[i]} />
                <text x={x} y={(y ?? 0) + 9} textAnchor="middle" fontSize={26} fontWeight={700} fill="#ffffff">
                  {i + 1}
                </text>
              </g>
            )
          })}
        </g>
        <g data-testid="road-shop">
          <rect
            x={SIZE / 2 - 16}
            y={SIZE / 2 - 16}
            width={32}
            height={32}
            rx={4}
            fill="#17181a"
            stroke="#ffffff"
            strokeWidth={3}
          />
          <text
            x={SIZE / 2}
            y={SIZE / 2 + 48}
            textAnchor="middle"
            fontSize={28}
            fontWeight={700}
            fill="#17181a"
            stroke="#ffffff"
            strokeWidth={6}
            paintOrder="stroke"
          >
            Shop
          </text>
        </g>
        <g transform={`translate(${SIZE - 60}, 70)`} aria-hidden>
          <path d="M0,-40 L14,0 L0,-10 L-14,0 Z" fill="#17181a" />
          <text y={28} textAnchor="middle" fontSize={26} fontWeight={700} fill="#17181a">
            N
          </text>
        </g>
        <g transform={`translate(40, ${SIZE - 50})`} data-testid="road-scale">
          <rect x={-8} y={-40} width={scale.meters * k + 16} height={58} fill="#ffffff" fillOpacity={0.85} rx={6} />
          <line x1={0} x2={scale.meters * k} y1={0} y2={0} stroke="#17181a" strokeWidth={5} />
          <line x1={0} x2={0} y1={-10} y2={10} stroke="#17181a" strokeWidth={4} />
          <line x1={scale.meters * k} x2={scale.meters * k} y1={-10} y2={10} stroke="#17181a" strokeWidth={4} />
          <text x={scale.meters * k * 0.5} y={-14} textAnchor="middle" fontSize={26} fill="#17181a">
            {scale.label}
          </text>
        </g>
      </svg>
      <figcaption className="text-sm text-graphite-600 dark:text-graphite-300">
        About {((2 * extent) / unitM).toFixed(1)} {unitWord} across. Hover or long-press a cell for its figures.
      </figcaption>
      <ul className="grid gap-1 text-sm sm:grid-cols-2" data-testid="road-legend" aria-label="Legend">
        {SHARE_CLASSES.map((c) => (
          <li key={c.key} className="flex items-center gap-2">
            <svg viewBox="0 0 20 20" className="size-5 shrink-0" aria-hidden>
              <polygon
                points="10,1 18,5.5 18,14.5 10,19 2,14.5 2,5.5"
                fill={SHARE_FILL[c.key]}
                fillOpacity={SHARE_OPACITY[c.key]}
                stroke="#17181a"
                strokeWidth={0.8}
              />
            </svg>
            {c.words}
          </li>
        ))}
        {view.loops.map((l, i) => (
          <li key={l.loopId} className="flex items-center gap-2">
            <svg viewBox="0 0 28 10" className="h-3 w-7 shrink-0" aria-hidden>
              <line
                x1={1}
                x2={27}
                y1={5}
                y2={5}
                stroke={LOOP_STROKE[i]}
                strokeWidth={3}
                strokeDasharray={LOOP_DASH[i]}
              />
            </svg>
            Track {i + 1}: fastest drive on {l.name}
          </li>
        ))}
        <li className="flex items-center gap-2">
          <svg viewBox="0 0 20 20" className="size-5 shrink-0" aria-hidden>
            <rect x={3} y={3} width={14} height={14} rx={2} fill="#17181a" />
          </svg>
          The shop
        </li>
      </ul>
    </figure>
  )
}
