/**
 * The few papaparse calls src-core makes, typed here on purpose. `@types/papaparse` starts with
 * `/// <reference types="node" />`, so importing the package by its own name would pull Node's types into the
 * src-core type check (tsconfig.core.json) and quietly let Node APIs through. Importing the same library file
 * under this subpath keeps src-core's check free of Node types.
 */
declare module 'papaparse/papaparse.js' {
  interface PapaParseError {
    type: string
    code: string
    message: string
    row?: number
  }
  interface PapaParseResult {
    data: string[][]
    errors: PapaParseError[]
    meta: { delimiter: string; linebreak: string; aborted: boolean; truncated: boolean; cursor: number }
  }
  interface PapaParseConfig {
    delimiter?: string
    newline?: string
    quoteChar?: string
    header?: false
    dynamicTyping?: false
    skipEmptyLines?: boolean | 'greedy'
  }
  const Papa: {
    parse(text: string, config?: PapaParseConfig): PapaParseResult
  }
  export default Papa
}
