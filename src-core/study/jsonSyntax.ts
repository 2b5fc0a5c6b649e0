/**
 * Where a JSON text stops being JSON. `JSON.parse` does the parsing; it is only when it fails that this scanner
 * walks the text (RFC 8259 grammar) to find the line and column of the first error, because Node's messages
 * do not always carry a position and never a line and column.
 */

export interface JsonSyntaxProblem {
  /** 0-based character offset of the error. */
  offset: number
  /** 1-based line and column. */
  line: number
  column: number
  message: string
  fix: string
}

class Stop {
  constructor(
    readonly offset: number,
    readonly message: string,
    readonly fix: string
  ) {}
}

/** Line and column (1-based) of a character offset. */
export function lineColumnAt(text: string, offset: number): { line: number; column: number } {
  let line = 1
  let start = 0
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++
      start = i + 1
    }
  }
  return { line, column: offset - start + 1 }
}

function shown(ch: string | undefined): string {
  if (ch === undefined) return 'the end of the file'
  if (ch === '\n' || ch === '\r') return 'the end of the line'
  return `"${ch}"`
}

/** Returns the first syntax error of `text`, or null when it is valid JSON. */
export function findJsonSyntaxError(text: string): JsonSyntaxProblem | null {
  let i = 0
  const n = text.length

  const ws = (): void => {
    while (i < n && (text[i] === ' ' || text[i] === '\t' || text[i] === '\n' || text[i] === '\r')) i++
  }

  const str = (): void => {
    const start = i
    i++ // opening quote
    while (i < n) {
      const c = text[i]
      if (c === '"') {
        i++
        return
      }
      if (c === '\\') {
        const e = text[i + 1]
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) throw new Stop(i, 'a \\u escape needs four hexadecimal digits', 'Write the character itself or a full escape like \\u00e9.')
          i += 6
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2
        else throw new Stop(i, `"\\${e ?? ''}" is not a JSON escape`, 'Write a backslash as \\\\ (e.g. in Windows paths).')
        continue
      }
      if (c === '\n' || c === '\r') throw new Stop(start, 'this text (string) is not closed before the end of the line', 'Add the closing double quote.')
      if (c.charCodeAt(0) < 0x20) throw new Stop(i, 'a control character (such as a tab) sits inside a text value', 'Write a tab as \\t, or remove it.')
      i++
    }
    throw new Stop(start, 'this text (string) is never closed', 'Add the closing double quote.')
  }

  const num = (): void => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i, i + 400))
    if (!m) throw new Stop(i, `${shown(text[i])} does not start a valid number`, 'Write numbers like 550, 0.5 or 1e-3 (no leading +, no leading zeros, a point as decimal separator).')
    i += m[0].length
    if (text[i] === ',' && /\d/.test(text[i + 1] ?? '')) {
      throw new Stop(i, 'a comma follows a number directly, as in a decimal comma', 'Use a point as the decimal separator (1.5, not 1,5).')
    }
  }

  const value = (): void => {
    ws()
    const c = text[i]
    if (c === '{') return obj()
    if (c === '[') return arr()
    if (c === '"') return str()
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) return num()
    for (const word of ['true', 'false', 'null']) {
      if (text.startsWith(word, i)) {
        i += word.length
        return
      }
    }
    if (c === "'") throw new Stop(i, 'text is in single quotes', 'JSON needs double quotes: "like this".')
    if (c === '}' || c === ']') throw new Stop(i, `a value is missing before ${shown(c)} (perhaps a trailing comma)`, 'Remove the comma before the closing bracket, or add the missing value.')
    if (c === undefined) throw new Stop(i, 'the file ends where a value should be', 'The file looks cut short; restore its end from a backup.')
    const word = /^[A-Za-z_]\w*/.exec(text.slice(i, i + 40))?.[0]
    if (word === 'NaN' || word === 'Infinity') throw new Stop(i, `${word} is not allowed in JSON`, 'Write a finite number.')
    throw new Stop(i, `${word ? `"${word}"` : shown(c)} is not a JSON value`, 'Write a number, "text" in double quotes, true, false, null, a list [...] or an object {...}.')
  }

  const obj = (): void => {
    i++
    ws()
    if (text[i] === '}') {
      i++
      return
    }
    for (;;) {
      ws()
      if (text[i] !== '"') {
        if (text[i] === undefined) throw new Stop(i, 'the file ends inside an object', 'The file looks cut short; restore its end from a backup.')
        if (text[i] === '}') throw new Stop(i, 'a comma before "}" leaves an empty entry (trailing comma)', 'Remove the last comma before the closing brace.')
        throw new Stop(i, `expected a field name in double quotes but found ${shown(text[i])}`, 'Write field names in double quotes, e.g. "name": "value".')
      }
      str()
      ws()
      if (text[i] !== ':') throw new Stop(i, `expected ":" after the field name but found ${shown(text[i])}`, 'Separate each field name from its value with a colon.')
      i++
      value()
      ws()
      if (text[i] === ',') {
        i++
        continue
      }
      if (text[i] === '}') {
        i++
        return
      }
      throw new Stop(i, `expected "," or "}" after a value but found ${shown(text[i])}`, text[i] === undefined ? 'The file looks cut short; restore its end from a backup.' : 'Add the missing comma between fields, or the missing closing brace.')
    }
  }

  const arr = (): void => {
    i++
    ws()
    if (text[i] === ']') {
      i++
      return
    }
    for (;;) {
      value()
      ws()
      if (text[i] === ',') {
        i++
        ws()
        if (text[i] === ']') throw new Stop(i, 'a comma before "]" leaves an empty entry (trailing comma)', 'Remove the last comma before the closing bracket.')
        continue
      }
      if (text[i] === ']') {
        i++
        return
      }
      throw new Stop(i, `expected "," or "]" in a list but found ${shown(text[i])}`, text[i] === undefined ? 'The file looks cut short; restore its end from a backup.' : 'Add the missing comma between list items, or the missing "]".')
    }
  }

  try {
    if (text.charCodeAt(0) === 0xfeff) i = 1
    ws()
    if (i >= n) throw new Stop(i, 'the file is empty', 'Open a study saved by Motebench, or start from the demo study (motebench demo).')
    value()
    ws()
    if (i < n) throw new Stop(i, `more text follows the end of the document (${shown(text[i])})`, 'Remove what follows the final closing brace, or merge it into the document.')
    return null
  } catch (e) {
    if (!(e instanceof Stop)) throw e
    return { offset: e.offset, ...lineColumnAt(text, e.offset), message: e.message, fix: e.fix }
  }
}

/** The separators a delimited table (CSV, TSV, a sizer export) may use between its fields. */
const TABLE_SEPARATORS = [',', ';', '\t'] as const

/**
 * True when `text` is not a JSON document but reads as a delimited table: it does not start with "{" or "[",
 * and among its first 40 non-blank lines at least two hold two or more numbers separated by the same comma,
 * semicolon or tab (a sizer export, a spreadsheet saved as CSV). Used to point the user to the sizer import
 * rather than report a JSON syntax error at line 1.
 */
export function looksLikeDelimitedTable(text: string): boolean {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text
  const start = body.trimStart()[0]
  if (start === undefined || start === '{' || start === '[') return false
  const lines = body.split(/\r?\n/, 400).filter((l) => l.trim() !== '').slice(0, 40)
  const isNumber = (field: string) => /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/.test(field.trim().replace(/^"|"$/g, ''))
  return TABLE_SEPARATORS.some((sep) => lines.filter((l) => l.split(sep).filter(isNumber).length >= 2).length >= 2)
}
