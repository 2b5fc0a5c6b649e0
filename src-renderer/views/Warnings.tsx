// A result's warnings (figures from a method outside its range; src-core words them), shown beside the figure.
export function Warnings(p: { items: readonly string[] | undefined; name: string }) {
  if (!p.items || p.items.length === 0) return null
  return (
    <ul class="warnings" role="note" data-testid={`warnings-${p.name}`} aria-label="Warnings">
      {p.items.map((w, k) => (
        <li key={k}>
          <span aria-hidden="true">⚠ </span>
          {w}
        </li>
      ))}
    </ul>
  )
}
