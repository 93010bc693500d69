// The page every page address answers while the database is not answering (proxy.ts sends it with a 503 and
// Retry-After). Plain HTML from the proxy itself, so it needs nothing that could fail with the database: no render,
// no session. The address stays the one asked for, so a reload asks again. Pure: no next/react/db imports.

const LOGO = `<svg viewBox="0 0 32 32" aria-hidden="true" width="40" height="40"><rect width="32" height="32" rx="7" fill="#272c33"/><path d="M6 28 L14.5 6 h3 L26 28 Z" fill="#5d6773"/><path d="M15.4 26 h1.2 l-0.3 -5 h-0.6 Z M15.6 18 h0.8 l-0.2 -3.5 h-0.4 Z M15.8 12 h0.4 l-0.1 -2.5 h-0.2 Z" fill="#ffbf3d"/></svg>`

const STYLE = `body{margin:0;font:16px/1.5 system-ui,sans-serif;background:#f5f6f7;color:#17181a}
main{max-width:28rem;min-height:100dvh;margin:0 auto;padding:0 1rem;display:flex;flex-direction:column;justify-content:center;gap:1rem}
h1{font-size:1.5rem;margin:0}p{margin:0}
a{display:inline-flex;align-items:center;min-height:3rem;padding:0 1rem;border-radius:.5rem;background:#17181a;color:#fff;font-weight:600;text-decoration:none;align-self:flex-start}
@media (prefers-color-scheme:dark){body{background:#17181a;color:#e8eaed}a{background:#ffbf3d;color:#17181a}}`

export function unavailablePageHtml(): string {
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex"><title>Back in a moment · Straightaway</title><style>${STYLE}</style></head>
<body><main data-testid="service-unavailable">${LOGO}
<h1>Back in a moment</h1>
<p>Straightaway cannot reach its records right now. Nothing you saved is lost: a drive being recorded keeps its data on the phone and sends it when the service is back.</p>
<p>Reload this page in a few seconds.</p>
<a href="">Reload</a>
</main></body></html>`
}
