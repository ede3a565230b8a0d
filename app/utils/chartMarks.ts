import type { ChartMarker, ChartThreshold } from '~/components/chart/ChartTimeSeries.client.vue'

type Priority = ChartThreshold['priority']

/** A rule's limit as a threshold line labelled with the rule's name and condition. */
export const ruleThresholdLine = (rule: { threshold: number, comparison: string, priority: string, name: string }): ChartThreshold =>
  ({ value: rule.threshold, priority: rule.priority as Priority, label: `${rule.name}: ${rule.comparison} ${formatValue(rule.threshold)}` })

/** An alarm's raising as a marker at its time, labelled with its priority. */
export const alarmMarker = (alarm: { time: number, priority: string }): ChartMarker =>
  ({ time: alarm.time, priority: alarm.priority as Priority, label: `${alarm.priority} alarm` })
