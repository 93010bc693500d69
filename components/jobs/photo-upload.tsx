"use client"

import { useQueryClient } from "@tanstack/react-query"
import { Camera, FileText, ImageOff } from "lucide-react"
import { useId, useState } from "react"
import { ALLOWED_UPLOAD_TYPES, MAX_UPLOAD_BYTES } from "@/lib/validation/upload"
import { apiFetch } from "@/lib/api/client"

export type AttachmentView = {
  id: string
  taskId: string | null
  filename: string
  contentType: string
  size: number
  url: string
  thumbnailUrl: string | null
}

// Some phones give HEIC photos no MIME type; the name tells.
function typeOf(file: File) {
  if (file.type) return file.type
  return /\.hei[cf]$/i.test(file.name) ? "image/heic" : "application/octet-stream"
}

/** Uploads straight to object storage through a presigned URL, then asks the server to check the bytes. */
async function uploadOne(jobId: string, taskId: string | null, file: File) {
  const contentType = typeOf(file)
  const { attachmentId, uploadUrl } = await apiFetch<{ attachmentId: string; uploadUrl: string }>("/api/uploads", {
    method: "POST",
    body: { jobId, taskId, filename: file.name, contentType, size: file.size },
  })
  const put = await fetch(uploadUrl, { method: "PUT", headers: { "content-type": contentType }, body: file })
  if (!put.ok) throw new Error(`${file.name} did not upload (storage answered ${put.status}). Try again.`)
  return apiFetch<{ attachment: AttachmentView }>(`/api/uploads/${attachmentId}/complete`, { method: "POST" })
}

export function PhotoUpload({
  jobId,
  taskId,
  attachments,
  canUpload,
}: {
  jobId: string
  taskId: string | null
  attachments: AttachmentView[]
  canUpload: boolean
}) {
  const id = useId()
  const queryClient = useQueryClient()
  const [busy, setBusy] = useState(false)
  const [problems, setProblems] = useState<string[]>([])

  async function onFiles(files: FileList | null) {
    if (!files?.length) return
    setBusy(true)
    setProblems([])
    const found: string[] = []
    for (const file of Array.from(files)) {
      if (file.size > MAX_UPLOAD_BYTES) {
        found.push(`${file.name} is over 15 MB.`)
        continue
      }
      try {
        await uploadOne(jobId, taskId, file)
      } catch (error) {
        found.push(error instanceof Error ? error.message : `${file.name} did not upload.`)
      }
    }
    setProblems(found)
    setBusy(false)
    await queryClient.invalidateQueries({ queryKey: ["job", jobId] })
  }

  return (
    <div className="space-y-2">
      {attachments.length ? (
        <ul className="flex flex-wrap gap-2" aria-label="Photos and files">
          {attachments.map((a) => (
            <li key={a.id}>
              <a href={a.url} target="_blank" rel="noreferrer" className="block" data-testid="attachment">
                {a.contentType === "image/heic" ? (
                  // The server's image library has no HEIC (HEVC) decoder, so there is no thumbnail; the link opens the photo.
                  <span className="flex size-20 flex-col items-center justify-center gap-1 rounded-lg border border-graphite-200 p-1 text-center text-xs dark:border-asphalt-700">
                    <ImageOff aria-hidden className="size-6" />
                    <span>HEIC photo (no preview)</span>
                    <span className="sr-only">{a.filename}</span>
                  </span>
                ) : a.thumbnailUrl ? (
                  // A 320 px JPEG made at upload.
                  // eslint-disable-next-line @next/next/no-img-element
                  <img
                    src={a.thumbnailUrl}
                    alt={a.filename}
                    width={80}
                    height={80}
                    loading="lazy"
                    className="size-20 rounded-lg border border-graphite-200 object-cover dark:border-asphalt-700"
                  />
                ) : (
                  <span className="flex size-20 flex-col items-center justify-center gap-1 rounded-lg border border-graphite-200 p-1 text-center text-xs dark:border-asphalt-700">
                    <FileText aria-hidden className="size-6" />
                    <span className="line-clamp-2 break-all">{a.filename}</span>
                  </span>
                )}
              </a>
            </li>
          ))}
        </ul>
      ) : null}
      {canUpload ? (
        <label
          htmlFor={id}
          className="inline-flex min-h-12 cursor-pointer items-center gap-2 rounded-lg border-2 border-dashed border-graphite-300 px-4 font-semibold hover:bg-graphite-100 dark:border-graphite-600 dark:hover:bg-asphalt-700"
        >
          <Camera aria-hidden className="size-5" />
          {busy ? "Uploading…" : "Add photos or a PDF"}
          <input
            id={id}
            type="file"
            multiple
            className="sr-only"
            accept={ALLOWED_UPLOAD_TYPES.join(",")}
            disabled={busy}
            onChange={(e) => {
              void onFiles(e.target.files)
              e.target.value = ""
            }}
          />
        </label>
      ) : null}
      {problems.map((p) => (
        <p key={p} role="alert" className="text-sm font-medium text-stop-600 dark:text-stop-400">
          {p}
        </p>
      ))}
    </div>
  )
}
