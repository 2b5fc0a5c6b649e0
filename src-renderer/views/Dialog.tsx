// A modal dialog on the native <dialog> element: focus stays inside, Escape closes.
import type { ComponentChildren } from 'preact'
import { useEffect, useRef } from 'preact/hooks'

export function Dialog(p: { title: string; onClose: () => void; children: ComponentChildren; name: string; wide?: boolean }) {
  const ref = useRef<HTMLDialogElement>(null)
  useEffect(() => {
    const d = ref.current
    if (d && !d.open) d.showModal()
    return () => d?.close()
  }, [])
  return (
    <dialog
      ref={ref}
      class={`dialog${p.wide ? ' wide' : ''}`}
      aria-labelledby={`${p.name}-title`}
      data-dialog={p.name}
      onCancel={(e) => {
        e.preventDefault()
        p.onClose()
      }}
    >
      <h2 id={`${p.name}-title`}>{p.title}</h2>
      {p.children}
    </dialog>
  )
}
