// Prints pipeline tick reports (POST /api/public/test/run-task → indicators:refresh) side by side.

/** The fields of server/services/pipeline/pipelineTick.ts TickReport the bench reads. */
export interface TickReport {
  tags: number
  samples: number
  evaluations: number
  ms: number
  evaluationThreads: number
  stages: Record<string, number>
}

export interface TickColumn {
  label: string
  report: TickReport
}

const WIDTH = 16
const cell = (text: string) => text.padStart(WIDTH)
const ms = (value: number) => cell(`${Math.round(value)} ms`)

export const threadsLabel = (report: TickReport) =>
  report.evaluationThreads === 0 ? 'main thread' : `${report.evaluationThreads} threads`

/**
 * Wall time, evaluations per second against what `needs` (tags at 1 Hz) require, then each stage.
 * Tags run in a few concurrent batches, so a stage's time is summed over them and can exceed the
 * wall time; 'evaluate' is each batch's awaited evaluation, queueing for a thread included.
 */
export function printTickColumns(title: string, columns: TickColumn[], evaluateEvery: number, needs: number[], intervalMs: number) {
  const [first] = columns
  if (!first) return
  const last = columns.at(-1)!
  // How many times faster the last column is than the first.
  const speedUp = columns.length > 1 ? cell(`${(first.report.ms / last.report.ms).toFixed(2)}×`) : ''
  const rate = (r: TickReport) => r.evaluations / (r.ms / 1000)
  console.log(`${title}: ${first.report.tags} tags, ${first.report.samples} samples, ${first.report.evaluations} evaluations`)
  console.log(`  ${''.padEnd(34)}${columns.map(c => cell(c.label)).join('')}${columns.length > 1 ? cell('speed-up') : ''}`)
  console.log(`  ${'wall'.padEnd(34)}${columns.map(c => ms(c.report.ms)).join('')}${speedUp}`)
  console.log(`  ${`share of the ${intervalMs / 1000} s tick interval`.padEnd(34)}${columns.map(c => cell(`${(100 * c.report.ms / intervalMs).toFixed(0)} %`)).join('')}`)
  console.log(`  ${'evaluations per second'.padEnd(34)}${columns.map(c => cell(rate(c.report).toFixed(0))).join('')}`)
  for (const tags of needs) {
    const need = tags / evaluateEvery
    const label = `  × ${tags.toLocaleString('en')} tags at 1 Hz (${need.toFixed(0)}/s)`
    console.log(`${label.padEnd(36)}${columns.map(c => cell(`${(rate(c.report) / need).toFixed(2)}×`)).join('')}`)
  }
  const stages = [...new Set(columns.flatMap(c => Object.keys(c.report.stages)))]
    .sort((a, b) => (first.report.stages[b] ?? 0) - (first.report.stages[a] ?? 0))
  for (const stage of stages)
    console.log(`  ${`  ${stage}`.padEnd(34)}${columns.map(c => ms(c.report.stages[stage] ?? 0)).join('')}`)
}
