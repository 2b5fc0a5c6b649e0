// Builds the command line to plain JavaScript: src-main/cli/main.ts and its worker threads, each bundled with
// what it imports (src-core and the libraries) into out/cli/*.mjs, so no TypeScript is compiled when a command
// runs. Run by `npm install` / `npm ci` (the "prepare" script) and by `npm run build:cli`; the tests run it too
// (test/global-setup.ts) so they exercise the current source. Uses esbuild's JavaScript API (its binary comes in
// the @esbuild/<platform> package; esbuild's own install script is not needed).
import { build } from 'esbuild'
import { fileURLToPath } from 'node:url'
import { readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { createHash } from 'node:crypto'
import { basename, join } from 'node:path'

const root = fileURLToPath(new URL('..', import.meta.url))

const ownModulesWithoutSideEffects = {
  name: 'own-modules-without-side-effects',
  setup(b) {
    b.onResolve({ filter: /^\.\.?\// }, async (args) => {
      if (args.pluginData?.own || args.importer.includes('/node_modules/')) return undefined
      const r = await b.resolve(args.path, { kind: args.kind, resolveDir: args.resolveDir, importer: args.importer, pluginData: { own: true } })
      if (r.errors.length > 0 || r.path.includes('/node_modules/') || !/\/src-(core|main)\//.test(r.path)) return r.errors.length > 0 ? { errors: r.errors } : undefined
      return { path: r.path, sideEffects: false }
    })
  }
}

// mathjs (about 900 KB bundled) is loaded only when a command reads a unit or a complex number or compiles a user
// expression: src-core makes its two mathjs instances in modules of their own (mathjsQuantities.ts, mathjsAll.ts),
// which are built apart as CommonJS files (out/cli/mathjs-*.cjs) and, in the commands' chunks, replaced by a
// module that requires them on first call. mathjs's chunk (0.9 MB) was about half of what the main thread of
// `motebench series` compiled at its start and most of what its worker did (0.10 s and 0.06 s of compiling in all,
// Node profiles at a low load), though neither reads a unit or an expression; every other command loaded it too.
const MATHJS_APART = { '/mathjsQuantities.ts': ['mathjs-quantities', 'makeQuantities'], '/mathjsAll.ts': ['mathjs-all', 'makeAll'] }

const mathjsOnFirstUse = {
  name: 'mathjs-on-first-use',
  setup(b) {
    b.onResolve({ filter: /\/mathjs(Quantities|All)\.ts$/ }, (args) => {
      if (!/[\\/]src-core[\\/]/.test(args.importer)) return undefined
      const key = Object.keys(MATHJS_APART).find((k) => args.path.endsWith(k))
      return key ? { path: key, namespace: 'mathjs-on-first-use', sideEffects: false } : undefined
    })
    b.onLoad({ filter: /.*/, namespace: 'mathjs-on-first-use' }, (args) => {
      const [file, name] = MATHJS_APART[args.path]
      return {
        contents: `import { createRequire } from 'node:module'\nexport function ${name}() { return createRequire(import.meta.url)('./${file}.cjs').${name}() }\n`,
        loader: 'js'
      }
    })
  }
}

export async function buildCli({ quiet = false } = {}) {
  const t0 = performance.now()
  const result = await build({
    absWorkingDir: root,
    entryPoints: {
      main: 'src-main/cli/main.ts',
      'series-worker': 'src-main/cli/workers/series-worker.ts',
      'uncertainty-worker': 'src-main/cli/workers/uncertainty-worker.ts'
    },
    // Each command is its own chunk (main.ts imports them on demand), so a command loads only what it uses.
    // Everything in one folder: src-main/cli/workers/start.ts finds a worker beside the chunk that starts it.
    splitting: true,
    chunkNames: '[name]-[hash]',
    outdir: 'out/cli',
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    minifyWhitespace: true,
    minifySyntax: true,
    // CommonJS libraries bundled into an ES module call require() for Node's built-ins
    banner: { js: "import { createRequire as __motebenchRequire } from 'node:module'; const require = __motebenchRequire(import.meta.url);" },
    // The project's own modules do nothing when imported but define things (none is imported for its side
    // effects), so a module a command does not use is left out of its chunk even when it comes through
    // src-core/index.ts.
    plugins: [mathjsOnFirstUse, ownModulesWithoutSideEffects],
    metafile: true,
    logLevel: 'warning'
  })
  await build({
    absWorkingDir: root,
    entryPoints: Object.fromEntries(Object.entries(MATHJS_APART).map(([path, [file]]) => [file, `src-core${path}`])),
    outdir: 'out/cli',
    outExtension: { '.js': '.cjs' },
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    minifyWhitespace: true,
    minifySyntax: true,
    logLevel: 'warning'
  })
  if (process.env.MOTEBENCH_BUILD_META) (await import('node:fs')).writeFileSync(process.env.MOTEBENCH_BUILD_META, JSON.stringify(result.metafile))
  // chunks of earlier builds (their names carry a hash of their content) are removed once the new ones are written
  const built = new Set(Object.keys(result.metafile.outputs).map((f) => basename(f)))
  for (const f of await readdir(join(root, 'out/cli'))) if (f.endsWith('.mjs') && !built.has(f)) await rm(join(root, 'out/cli', f), { force: true })
  // The build's id: a hash of every built file, by which `series` knows its kernels kept on disk are this build's
  // (src-main/cli/kernel-cache.ts)
  const hash = createHash('sha256')
  for (const f of (await readdir(join(root, 'out/cli'))).filter((f) => /\.(mjs|cjs)$/.test(f)).sort()) hash.update(`${f}\n`).update(await readFile(join(root, 'out/cli', f)))
  await writeFile(join(root, 'out/cli/build-id'), hash.digest('hex') + '\n')
  if (!quiet) process.stdout.write(`motebench: command line built into out/cli in ${Math.round(performance.now() - t0)} ms\n`)
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) await buildCli()
