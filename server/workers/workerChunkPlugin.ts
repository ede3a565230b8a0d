import { resolve } from 'node:path'
import { build } from 'esbuild'
import type { Plugin } from 'rollup'

/** Imported by server code for the URL of the bundled evaluation worker. */
export const EVALUATION_WORKER_MODULE = 'brinkline:evaluation-worker'
const RESOLVED_ID = `\0${EVALUATION_WORKER_MODULE}`

// CommonJS packages bundled into an ES module still call require() for Node built-ins.
const REQUIRE_SHIM = `import { createRequire as __workerRequire } from 'node:module'; const require = __workerRequire(import.meta.url);`

/**
 * Nitro bundles all server code into .output/server, but a worker thread loads its code from a
 * file, so the worker entry has to be a file of the output too. It is bundled on its own, into
 * one self-contained file: as an extra chunk of Nitro's own bundle it would share Nitro's main
 * chunk (Nitro's manualChunks pulls every module the runtime imports into chunks/nitro/nitro.mjs),
 * and importing that chunk starts a whole server, scheduler and migrations included, in every
 * thread. Server code gets the file's URL through Rollup's import.meta.ROLLUP_FILE_URL_…, formed
 * at run time, so it stays right wherever .output is moved.
 */
export function workerChunkPlugin(entry: string, fileName: string): Plugin {
  let workerRef: string | undefined
  return {
    name: 'brinkline-worker-chunk',
    resolveId: id => (id === EVALUATION_WORKER_MODULE ? RESOLVED_ID : null),
    async load(id) {
      if (id !== RESOLVED_ID) return null
      const root = process.cwd()
      const bundle = await build({
        entryPoints: [entry], absWorkingDir: root, bundle: true, platform: 'node', format: 'esm', target: 'node20',
        banner: { js: REQUIRE_SHIM }, write: false, metafile: true, logLevel: 'warning',
      })
      // Dev rebuilds when the engine changes.
      for (const input of Object.keys(bundle.metafile.inputs)) this.addWatchFile(resolve(root, input))
      workerRef = this.emitFile({ type: 'asset', fileName, source: bundle.outputFiles[0]!.text })
      // A function, not a constant: Nitro's entry sets import.meta.url for all chunks only after
      // they have been evaluated, so at a chunk's top level it is still a placeholder.
      return `export const evaluationWorkerUrl = () => import.meta.ROLLUP_FILE_URL_${workerRef}`
    },
    // Rollup would form the URL relative to the chunk that asks, but Nitro points every chunk's
    // import.meta.url at its entry (index.mjs, at the root of the output), so it is formed from
    // the file's place in the output instead.
    resolveFileUrl: ({ referenceId, fileName: emitted }) =>
      (referenceId === workerRef ? `new URL(${JSON.stringify(`./${emitted}`)}, import.meta.url).href` : null),
  }
}
