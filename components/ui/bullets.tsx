/** A bulleted list of sentences, each its own key: reasons, cautions, the rules a profile holds a drive to. */
export function Bullets({
  items,
  className,
  testId,
}: {
  items: readonly string[]
  className: string
  testId?: string
}) {
  return (
    <ul className={className} data-testid={testId}>
      {items.map((item) => (
        <li key={item}>{item}</li>
      ))}
    </ul>
  )
}
