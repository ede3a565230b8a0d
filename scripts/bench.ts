// `npm run bench`: every benchmark module in scripts/bench/ exports `run()`, which prints its
// own side-by-side ratios. Modules run one after another so they do not share the two cores.
import { readdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const dir = fileURLToPath(new URL('./bench/', import.meta.url))
const only = process.argv[2]
for (const file of readdirSync(dir).filter(f => f.endsWith('.ts')).sort()) {
  if (only && !file.includes(only)) continue
  const mod = await import(new URL(`./bench/${file}`, import.meta.url).href) as { run: () => Promise<void> }
  console.log(`\n=== ${file.replace(/\.ts$/, '')} ===`)
  await mod.run()
}
