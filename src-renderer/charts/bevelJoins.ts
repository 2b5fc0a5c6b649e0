// uPlot strokes every series with round line joins: it sets `ctx.lineJoin = 'round'` itself before each stroke and
// has no option for it. On a dense line (a year of the station record decimated to the chart's width has a corner
// every pixel or two) Chromium's software raster draws round joins several times slower than bevelled ones (a page
// stroking a dense zigzag of 2,460 points at 1.6 px: 30.5 ms round, 5.4 ms bevelled). A bevelled corner lies inside
// the round one by w/2·(1 − cos(φ/2)) for a turn of φ: at w = 1.6 px under a quarter of a pixel up to 90°, 0.8 px
// at most. `bevelJoins` makes one chart's drawing context turn a request for round joins into bevelled ones; every
// other property of the context is untouched.

const lineJoin = Object.getOwnPropertyDescriptor(CanvasRenderingContext2D.prototype, 'lineJoin')

/** From now on, `ctx` draws bevelled joins where round ones are asked for (this context only). */
export function bevelJoins(ctx: CanvasRenderingContext2D): void {
  if (!lineJoin?.get || !lineJoin.set) return
  const { get, set } = lineJoin
  Object.defineProperty(ctx, 'lineJoin', {
    configurable: true,
    get(this: CanvasRenderingContext2D) {
      return get.call(this)
    },
    set(this: CanvasRenderingContext2D, v: CanvasLineJoin) {
      set.call(this, v === 'round' ? 'bevel' : v)
    }
  })
}
