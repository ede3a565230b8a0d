// Where a tag's stored evaluations said "slowing down", as runs of consecutive evaluations: the
// incident timeline states them in words beside the judgement chart (readable in print and by a
// screen reader, where a line on a canvas is not).

export interface JudgementRun {
  /** Epoch seconds of the first and the last evaluation of the run. */
  from: number
  to: number
}

/** Runs of consecutive `verdict` evaluations, oldest first; `time` and `evidence` are aligned. */
export function judgementRuns(time: readonly number[], evidence: readonly (string | null)[], verdict = 'slowing down'): JudgementRun[] {
  const runs: JudgementRun[] = []
  let open: JudgementRun | null = null
  time.forEach((t, i) => {
    if (evidence[i] === verdict) {
      if (open) open.to = t
      else open = { from: t, to: t }
    }
    else if (open) {
      runs.push(open)
      open = null
    }
  })
  if (open) runs.push(open)
  return runs
}
