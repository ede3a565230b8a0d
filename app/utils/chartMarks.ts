import type { ChartMarker, ChartThreshold } from '~/components/chart/ChartTimeSeries.client.vue'

type Priority = ChartThreshold['priority']

/** A rule's limit as a threshold line labelled with the rule's name and condition (a value limit in the tag's unit and decimals). */
export function ruleThresholdLine(
  rule: { threshold: number, comparison: string, priority: string, name: string, measure?: string },
  tag?: { engineeringUnit: string, rangeLow: number, rangeHigh: number },
): ChartThreshold {
  const measure = rule.measure ?? 'value'
  const condition = conditionText({ measure, comparison: rule.comparison, threshold: rule.threshold, ...(measure === 'value' ? tag : {}) })
  return { value: rule.threshold, priority: rule.priority as Priority, label: `${rule.name}: ${condition.replace(/^value /, '')}` }
}

/**
 * An alarm's activation as a marker at its time: "urgent alarm", "medium advisory alert" (an
 * alert is advisory, never called an alarm); a re-activation is dashed and says which one it is.
 */
export const alarmMarker = (mark: { time: number, priority: string, alarmClass?: string, activation?: number }): ChartMarker => {
  const kind = mark.alarmClass === 'alert' ? 'alert' : 'alarm'
  const again = (mark.activation ?? 1) > 1
  return {
    time: mark.time,
    priority: mark.priority as Priority,
    label: again ? `${kind} again (#${mark.activation})` : `${mark.priority} ${kind}`,
    dashed: again,
  }
}
