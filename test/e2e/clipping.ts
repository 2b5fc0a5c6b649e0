// What is cut off on screen: controls and tables that reach past the box that clips them (with no scroll cue), and
// text fields whose text is wider than the field. Used by the end-to-end layout test.
import type { Page } from 'playwright-core'

export interface Clipped {
  what: string
  why: string
}

/** Everything the user needs that is cut off in the page as it is now (empty when nothing is). */
export function findClipped(page: Page, root = 'body'): Promise<Clipped[]> {
  // given as text: the test runners' transforms add helpers (__name) to a function, which the page does not have
  return page.evaluate('(' + CHECK + ')(' + JSON.stringify(root) + ')') as Promise<Clipped[]>
}

const CHECK = String.raw`function (rootSel) {
  var out = []
  function name(e) {
    var label = e.getAttribute('aria-label') || e.getAttribute('data-path') || e.getAttribute('data-testid') || e.getAttribute('name') || (e.textContent || '').trim().slice(0, 30)
    return e.tagName.toLowerCase() + (typeof e.className === 'string' && e.className ? '.' + e.className.split(' ').join('.') : '') + ' “' + label + '”'
  }
  function shown(el) {
    var r = el.getBoundingClientRect()
    if (r.width === 0 || r.height === 0) return false
    var s = getComputedStyle(el)
    return s.visibility !== 'hidden' && s.display !== 'none' && !el.closest('.sr-only, [hidden]')
  }
  // the nearest ancestor that cuts off what reaches past its sides
  function clipper(el) {
    for (var a = el.parentElement; a; a = a.parentElement) if (getComputedStyle(a).overflowX !== 'visible') return a
    return null
  }
  var top = document.querySelector(rootSel) || document.body
  var els = top.querySelectorAll('button, input, select, textarea, table, [data-chart]')
  for (var i = 0; i < els.length; i++) {
    var el = els[i]
    if (!shown(el)) continue
    var r = el.getBoundingClientRect()
    var c = clipper(el)
    // a sideways-scrolling table box must show its cue (data-overflow and a visible .scroll-cue beside it)
    var cue = !!c && c.dataset.overflow === 'true' && !!c.parentElement && !!c.parentElement.querySelector(':scope > .scroll-cue')
    // what a box with its cue scrolls out of sight may lie past the window's edge: the cue says it is there
    if ((r.right > window.innerWidth + 1 || r.left < -1) && !cue) out.push({ what: name(el), why: 'reaches past the window (' + Math.round(r.left) + '–' + Math.round(r.right) + ' of ' + window.innerWidth + ' px)' })
    if (c) {
      var b = c.getBoundingClientRect()
      var right = b.left + c.clientLeft + c.clientWidth
      var scrolls = c.scrollWidth > c.clientWidth + 1 && getComputedStyle(c).overflowX !== 'hidden'
      if (scrolls && !cue && el.tagName === 'TABLE' && r.right > right + 1) out.push({ what: name(el), why: 'overflows ' + name(c) + ' sideways (' + c.scrollWidth + ' > ' + c.clientWidth + ' px) with no scroll cue' })
      else if (!scrolls && r.right > right + 1 && r.left < right) out.push({ what: name(el), why: 'cut off at the right of ' + name(c) + ' (' + Math.round(r.right) + ' > ' + Math.round(right) + ' px)' })
      else if (scrolls && !cue && !el.closest('table') && r.right > right + 1) out.push({ what: name(el), why: 'reaches past ' + name(c) + ' (' + Math.round(r.right) + ' > ' + Math.round(right) + ' px) with no scroll cue' })
    }
    // text wider than its field (a name or a list cut short)
    var textField = (el.tagName === 'INPUT' && (el.type === 'text' || el.type === 'search')) || el.tagName === 'TEXTAREA'
    if (textField && el.value && el.scrollWidth > el.clientWidth + 1) out.push({ what: name(el), why: 'its text “' + el.value.slice(0, 40) + '” is wider than the field (' + el.scrollWidth + ' > ' + el.clientWidth + ' px)' })
    // a drop-down narrower than it needs to show its choice whole: a copy of it beside it (same classes, so the same
    // font and padding), holding only that choice and free to take its natural width, measures what it needs
    if (el.tagName === 'SELECT' && el.selectedIndex >= 0) {
      var text = el.options[el.selectedIndex].text
      var probe = el.cloneNode(false)
      probe.removeAttribute('id')
      probe.append(new Option(text))
      probe.style.cssText = 'position:absolute;visibility:hidden;width:auto;min-width:0;max-width:none'
      el.parentElement.append(probe)
      var need = probe.getBoundingClientRect().width
      probe.remove()
      var have = el.getBoundingClientRect().width
      if (need > have + 1) out.push({ what: name(el), why: 'its choice “' + text.slice(0, 40) + '” does not fit the drop-down (' + Math.round(need) + ' > ' + Math.round(have) + ' px)' })
    }
  }
  return out
}`
