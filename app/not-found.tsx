import { BARE_PAGE_ACTION, BarePage, LineIcon } from "@/components/shell/bare-page"

/**
 * Every refusal and every address that leads nowhere ends here, with a way back. A plain link, not next/link:
 * this page is part of every page's tree, so its client code would be on every first load (the recorder's too).
 * For the same reason the arrow is drawn here (lucide's arrow-left, whose React component is a client module).
 */
export default function NotFound() {
  return (
    <BarePage
      title="Nothing to show here"
      action={
        <a href="/" className={BARE_PAGE_ACTION} data-testid="way-back">
          <LineIcon>
            <path d="m12 19-7-7 7-7" />
            <path d="M19 12H5" />
          </LineIcon>{" "}
          Back to the start
        </a>
      }
    >
      This page does not exist, or it belongs to a drive or job you cannot open.
    </BarePage>
  )
}
