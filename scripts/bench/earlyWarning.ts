// Early-warning detection benchmark: the live procedure beside the Dakos et al. 2012 pipeline on
// the same seeded model records and nulls (scripts/bench/detectionStudy/). `--quick` runs fewer
// seeds: npx tsx scripts/bench.ts earlyWarning [--quick]
import { runStudy } from './detectionStudy/study'

export async function run(): Promise<void> {
  await runStudy(process.argv.includes('--quick'))
}
