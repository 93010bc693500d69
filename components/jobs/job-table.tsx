"use client"

import { keepPreviousData, useQuery } from "@tanstack/react-query"
import { LocalTime } from "@/components/ui/local-time"
import {
  createColumnHelper,
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
  type PaginationState,
  type SortingState,
} from "@tanstack/react-table"
import { ArrowDown, ArrowUp, ArrowUpDown, ChevronLeft, ChevronRight, Search } from "lucide-react"
import Link from "next/link"
import { useEffect, useMemo, useState } from "react"
import { Button } from "@/components/ui/button"
import { Input, Select } from "@/components/ui/field"
import { FormProblem, Options } from "@/components/ui/form"
import { JOB_STATUS_LABEL, JOB_STATUSES, SENSOR_LABEL, type JobSort, type Sensor } from "@/lib/validation/job"
import { api } from "@/lib/api/client"
import type { JobListPage, Wire } from "@/lib/api/types"
import { JobStatusBadge } from "./job-status"

type JobRow = Wire<JobListPage>["jobs"][number]

// Sorting and paging happen on the server; the table only keeps their state.
const features = tableFeatures({ rowSortingFeature, rowPaginationFeature })
const helper = createColumnHelper<typeof features, JobRow>()
const columns = helper.columns([
  helper.accessor("roNumber", {
    id: "roNumber",
    header: "RO",
    cell: (info) => (
      <Link
        href={`/jobs/${info.row.original.id}`}
        className="inline-flex min-h-12 items-center font-semibold underline-offset-4 hover:underline"
      >
        {info.getValue()}
      </Link>
    ),
  }),
  helper.accessor((row) => row.customer.name, { id: "customer", header: "Customer" }),
  helper.accessor((row) => vehicleText(row.vehicle), {
    id: "vehicle",
    header: "Vehicle",
    enableSorting: false,
    cell: (info) => (
      <span>
        {info.getValue()}
        <span className="block font-mono text-xs text-graphite-500 dark:text-graphite-300">
          …{info.row.original.vehicle.vin.slice(-8)}
        </span>
      </span>
    ),
  }),
  helper.accessor((row) => row.sensors.map((s) => SENSOR_LABEL[s as Sensor] ?? s).join(", "), {
    id: "sensors",
    header: "Calibrations",
    enableSorting: false,
  }),
  helper.accessor("status", {
    id: "status",
    header: "Status",
    cell: (info) => <JobStatusBadge status={info.getValue()} />,
  }),
  helper.accessor("createdAt", {
    id: "createdAt",
    header: "Opened",
    cell: (info) => (
      <>
        <span className="md:hidden">Opened </span>
        <LocalTime iso={info.getValue()} style="date" />
      </>
    ),
  }),
])

const emptyRows: JobRow[] = []

// Where each cell sits when a row is a block on a phone: RO and status on the first line, the rest below.
const PHONE_CELL: Record<string, string> = {
  status: "max-md:col-start-2 max-md:row-start-1",
  customer: "max-md:col-span-2",
  vehicle: "max-md:col-span-2",
  sensors: "max-md:col-span-2 max-md:text-graphite-600 max-md:dark:text-graphite-300",
  createdAt: "max-md:col-span-2 max-md:text-graphite-600 max-md:dark:text-graphite-300",
}

/** The sort choices on a phone (no column headers there), as `column:direction`. */
const PHONE_SORTS = ["createdAt:desc", "createdAt:asc", "roNumber:asc", "customer:asc", "status:asc"] as const
const PHONE_SORT_LABEL: Record<(typeof PHONE_SORTS)[number], string> = {
  "createdAt:desc": "Newest first",
  "createdAt:asc": "Oldest first",
  "roNumber:asc": "RO number",
  "customer:asc": "Customer A–Z",
  "status:asc": "Status",
}

function vehicleText(v: JobRow["vehicle"]) {
  return [v.year, v.make, v.model].filter(Boolean).join(" ") || "Vehicle"
}

export function JobTable() {
  const [sorting, setSorting] = useState<SortingState>([{ id: "createdAt", desc: true }])
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 20 })
  const [status, setStatus] = useState("")
  const [searchBox, setSearchBox] = useState("")
  const [q, setQ] = useState("")
  // Keyset paging: the cursor for page n is the nextCursor the server gave with page n-1.
  const [cursors, setCursors] = useState<(string | null)[]>([null])

  useEffect(() => {
    const timer = setTimeout(() => setQ(searchBox.trim()), 300)
    return () => clearTimeout(timer)
  }, [searchBox])

  const sort = (sorting[0]?.id ?? "createdAt") as JobSort
  const dir = sorting[0]?.desc === false ? "asc" : "desc"
  const filterKey = `${status}|${q}|${sort}|${dir}|${pagination.pageSize}`
  // A new filter, sort or page size starts again at page one (adjusted during render, React's pattern for state
  // that follows other state).
  const [shownFilterKey, setShownFilterKey] = useState(filterKey)
  if (filterKey !== shownFilterKey) {
    setShownFilterKey(filterKey)
    setCursors([null])
    setPagination((p) => ({ ...p, pageIndex: 0 }))
  }

  const cursor = cursors[pagination.pageIndex] ?? null
  const params = useMemo(() => {
    const p = new URLSearchParams({ sort, dir, limit: String(pagination.pageSize) })
    if (status) p.set("status", status)
    if (q) p.set("q", q)
    if (cursor) p.set("cursor", cursor)
    return p.toString()
  }, [sort, dir, pagination.pageSize, status, q, cursor])

  const result = useQuery({
    queryKey: ["jobs", { status, q, sort, dir, pageSize: pagination.pageSize, cursor }],
    queryFn: () => api.jobs(params),
    placeholderData: keepPreviousData,
  })

  // The page just loaded names the cursor of the next one; pages after it are forgotten.
  const next = result.isPlaceholderData ? undefined : result.data?.nextCursor
  if (next && (cursors[pagination.pageIndex + 1] !== next || cursors.length > pagination.pageIndex + 2)) {
    const copy = cursors.slice(0, pagination.pageIndex + 1)
    copy[pagination.pageIndex + 1] = next
    setCursors(copy)
  }

  const table = useTable({
    features,
    columns,
    data: result.data?.jobs ?? emptyRows,
    rowCount: result.data?.total,
    state: { sorting, pagination },
    onSortingChange: setSorting,
    onPaginationChange: setPagination,
    manualSorting: true,
    manualPagination: true,
    enableMultiSort: false,
    enableSortingRemoval: false,
  })

  const total = result.data?.total ?? 0
  const first = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1
  const last = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize)
  const canNext = Boolean(cursors[pagination.pageIndex + 1]) && !result.isPlaceholderData

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap gap-2">
        <div className="relative min-w-56 flex-1">
          <Search
            aria-hidden
            className="pointer-events-none absolute top-1/2 left-3 size-5 -translate-y-1/2 text-graphite-400"
          />
          <label htmlFor="job-search" className="sr-only">
            Search jobs
          </label>
          <Input
            id="job-search"
            type="search"
            className="pl-10"
            placeholder="RO, customer, VIN, plate…"
            value={searchBox}
            onChange={(e) => setSearchBox(e.target.value)}
          />
        </div>
        <label htmlFor="job-status" className="sr-only">
          Status
        </label>
        <Select id="job-status" className="w-auto min-w-40" value={status} onChange={(e) => setStatus(e.target.value)}>
          <option value="">Every status</option>
          <Options values={JOB_STATUSES} labels={JOB_STATUS_LABEL} />
        </Select>
        {/* Phones show rows as blocks with no column heads, so sorting is a plain choice here. */}
        <label htmlFor="job-sort" className="sr-only">
          Sort jobs
        </label>
        <Select
          id="job-sort"
          className="w-auto min-w-40 md:hidden"
          value={`${sort}:${dir}`}
          onChange={(e) => {
            const [id, d] = e.target.value.split(":")
            setSorting([{ id: id!, desc: d === "desc" }])
          }}
        >
          <Options values={PHONE_SORTS} labels={PHONE_SORT_LABEL} />
        </Select>
      </div>

      <div className="relative overflow-x-auto rounded-xl border border-graphite-200 bg-white dark:border-asphalt-700 dark:bg-asphalt-800">
        <table className="w-full text-left text-sm max-md:block md:min-w-[40rem]" aria-busy={result.isFetching}>
          <thead className="border-b border-graphite-200 max-md:hidden dark:border-asphalt-700">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted()
                  const Icon = sorted === "asc" ? ArrowUp : sorted === "desc" ? ArrowDown : ArrowUpDown
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="px-3 py-1 font-semibold text-graphite-600 dark:text-graphite-300"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}
                    >
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          className="inline-flex min-h-12 items-center gap-1"
                          onClick={header.column.getToggleSortingHandler()}
                        >
                          <table.FlexRender header={header} />
                          <Icon aria-hidden className="size-4" />
                          <span className="sr-only">
                            {sorted ? `sorted ${sorted === "asc" ? "ascending" : "descending"}` : "sort"}
                          </span>
                        </button>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                    </th>
                  )
                })}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-graphite-100 max-md:block dark:divide-asphalt-700">
            {table.getRowModel().rows.map((row) => (
              <tr
                key={row.id}
                data-testid="job-row"
                className="max-md:grid max-md:grid-cols-[1fr_auto] max-md:items-center max-md:gap-x-3 max-md:px-3 max-md:py-2"
              >
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className={`px-3 py-1 align-middle max-md:p-0 ${PHONE_CELL[cell.column.id] ?? ""}`}>
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        {result.isError ? <FormProblem className="p-4">{(result.error as Error).message}</FormProblem> : null}
        {result.isPending ? (
          <p role="status" className="p-4 text-graphite-600 dark:text-graphite-300">
            Loading jobs…
          </p>
        ) : null}
        {result.data && total === 0 ? (
          <p className="p-4 text-graphite-600 dark:text-graphite-300">
            {q || status ? "No job matches." : "No jobs yet. Open the first one."}
          </p>
        ) : null}
      </div>

      <div className="flex items-center justify-between gap-2">
        <p className="tabular text-sm text-graphite-600 dark:text-graphite-300">
          {total ? `${first}–${last} of ${total}` : ""}
        </p>
        <div className="flex gap-2">
          <Button
            variant="outline"
            aria-label="Previous page"
            disabled={pagination.pageIndex === 0}
            onClick={() => table.previousPage()}
          >
            <ChevronLeft aria-hidden className="size-5" />
          </Button>
          <Button variant="outline" aria-label="Next page" disabled={!canNext} onClick={() => table.nextPage()}>
            <ChevronRight aria-hidden className="size-5" />
          </Button>
        </div>
      </div>
    </div>
  )
}
