// A box for a wide table: it scrolls sideways when the table is wider than the room, and then says so (a line
// above the table and a shade at the edge that has more), so that no column is cut off unseen.
import type { ComponentChildren } from 'preact'
import { useEffect, useRef, useState } from 'preact/hooks'

export function ScrollWrap(p: { label: string; children: ComponentChildren }) {
  const box = useRef<HTMLDivElement>(null)
  const [over, setOver] = useState<{ left: boolean; right: boolean } | null>(null)
  useEffect(() => {
    const el = box.current
    if (!el) return
    const check = () => {
      const wide = el.scrollWidth > el.clientWidth + 1
      const next = wide ? { left: el.scrollLeft > 1, right: el.scrollLeft + el.clientWidth < el.scrollWidth - 1 } : null
      setOver((was) => (JSON.stringify(was) === JSON.stringify(next) ? was : next))
    }
    check()
    const ro = new ResizeObserver(check)
    ro.observe(el)
    if (el.firstElementChild) ro.observe(el.firstElementChild)
    el.addEventListener('scroll', check, { passive: true })
    return () => {
      ro.disconnect()
      el.removeEventListener('scroll', check)
    }
  }, [])
  return (
    <div class="scroll-block">
      {over && (
        <p class="scroll-cue" aria-hidden="true">
          {over.right ? 'More columns to the right: scroll sideways →' : '← More columns to the left'}
        </p>
      )}
      <div
        ref={box}
        class={`table-wrap${over?.right ? ' more-right' : ''}${over?.left ? ' more-left' : ''}`}
        data-overflow={over ? 'true' : 'false'}
        tabIndex={over ? 0 : undefined}
        role={over ? 'region' : undefined}
        aria-label={over ? `${p.label} (scrolls sideways)` : undefined}
      >
        {p.children}
      </div>
    </div>
  )
}
