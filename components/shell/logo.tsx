/** The Straightaway mark: a straight road vanishing to a point, with a centre line. Drawn for this product. */
export function Logo({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden className={className}>
      <rect width="32" height="32" rx="7" fill="#272c33" />
      <path d="M6 28 L14.5 6 h3 L26 28 Z" fill="#5d6773" />
      <path
        d="M15.4 26 h1.2 l-0.3 -5 h-0.6 Z M15.6 18 h0.8 l-0.2 -3.5 h-0.4 Z M15.8 12 h0.4 l-0.1 -2.5 h-0.2 Z"
        fill="#ffbf3d"
      />
    </svg>
  )
}
