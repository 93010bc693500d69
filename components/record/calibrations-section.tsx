import { Bullets } from "@/components/ui/bullets"
import { Card } from "@/components/ui/card"
import type { UnitSystem } from "@/lib/format"
import {
  checkWords,
  measurementWords,
  METHOD_LABEL,
  scanResultWords,
  SENSOR_LABEL,
  VERDICT_WORD,
  type CalibrationRecord,
} from "@/lib/record"

const verdictWord = (v: string | null) => (v ? ((VERDICT_WORD as Record<string, string>)[v] ?? v) : "not finished")

/** The record's per-system part (share page and drive page): set-up, learn drive, road-test checks, cautions. */
export function CalibrationsSection({
  calibrations,
  units = "imperial",
}: {
  calibrations: CalibrationRecord[] | undefined
  units?: UnitSystem
}) {
  if (!calibrations?.length) return null
  return (
    <section aria-labelledby="each-system" className="space-y-3" data-testid="record-calibrations">
      <h2 id="each-system" className="text-lg font-semibold">
        Each system calibrated on this job
      </h2>
      {calibrations.map((sys, i) => (
        <Card key={`${sys.sensor}-${i}`} className="space-y-2">
          <h3 className="font-semibold">
            {SENSOR_LABEL[sys.sensor] ?? sys.sensor} · {METHOD_LABEL[sys.method] ?? sys.method}
          </h3>
          {sys.method !== "dynamic" ? (
            sys.setup ? (
              <div>
                <p className="text-sm font-semibold">
                  Static set-up (figures from the maker&apos;s service information)
                </p>
                <ul className="list-disc pl-5 text-sm">
                  {sys.setup.measurements.map((m) => (
                    <li
                      key={m.label}
                      className={m.outOfTolerance ? "font-semibold text-stop-700 dark:text-stop-400" : undefined}
                    >
                      {m.label}: {measurementWords(m)}
                    </li>
                  ))}
                  <li>
                    Scan tool: {scanResultWords(sys.setup.scanResult)}
                    {sys.setup.scanNotes ? `: ${sys.setup.scanNotes}` : ""}
                  </li>
                  {sys.setup.override ? <li>Lead&apos;s override: {sys.setup.override.note}</li> : null}
                </ul>
              </div>
            ) : (
              <p className="text-sm">No static set-up was recorded.</p>
            )
          ) : null}
          {sys.learnDrives.map((d) => (
            <p key={d.driveId} className="text-sm">
              Learn drive {d.driveId.slice(0, 8)}: {verdictWord(d.verdict)}
            </p>
          ))}
          {sys.roadTest ? (
            <div>
              <p className="text-sm font-semibold">Road test: {verdictWord(sys.roadTest.verdict)}</p>
              <ul className="list-disc pl-5 text-sm">
                {sys.roadTest.checks.map((c) => (
                  <li key={c.label}>
                    {c.label}: {checkWords(c, units)}
                  </li>
                ))}
              </ul>
            </div>
          ) : (
            <p className="text-sm">No road test recorded.</p>
          )}
          <Bullets className="list-disc pl-5 text-xs text-graphite-600 dark:text-graphite-300" items={sys.cautions} />
        </Card>
      ))}
    </section>
  )
}
