// Demo alarm rules and the on-call route for the invented demo site. Thresholds sit on each
// simulated plant's own scale (shared/demo/catalogue.ts); the rationale texts are written for the
// demo, like the plant itself.
import { and, eq, inArray } from 'drizzle-orm'
import { defaultIndicatorSettings, EARLY_WARNING_DELAYS, evaluationIntervalS, FOLD_IN_VIEW_DELAYS } from '#shared/pipeline/indicatorDefaults'
import type { AlarmClass, Comparison, Priority, TagMeasure } from '#shared/alarms/vocabulary'
import { alarmRules, notificationRoutes, tags } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'

interface DemoRule {
  tag: string
  name: string
  measure: TagMeasure
  comparison: Comparison
  threshold: number
  deadband?: number
  /** Seconds, or evaluations of the trend tests when given as { evaluations }. */
  onDelay: number | { evaluations: number }
  offDelay: number | { evaluations: number }
  priority: Priority
  alarmClass: AlarmClass
  consequence: string
  likelyCause: string
  operatorAction: string
}

const slowingDown = (tag: string, unit: string, what: string, action: string): DemoRule => ({
  tag, name: `${unit} ${tag} slowing down`, measure: 'early_warning', comparison: 'above', threshold: 0.5,
  // Calibrated on the whole live procedure (shared/pipeline/indicatorDefaults.ts EARLY_WARNING_DELAYS).
  onDelay: { evaluations: EARLY_WARNING_DELAYS.onDelayEvaluations }, offDelay: { evaluations: EARLY_WARNING_DELAYS.offDelayEvaluations },
  priority: 'medium', alarmClass: 'alert',
  consequence: `${what} is losing resilience; left alone it may tip to its other state.`,
  likelyCause: 'A slow drift in a driving condition is taking the process toward a fold.',
  operatorAction: action,
})

// A fold projected closer than `thresholdS`: a high-priority alarm with the fold-in-view delays
// (shared/pipeline/indicatorDefaults.ts FOLD_IN_VIEW_DELAYS) and 5 minutes of deadband.
type RuleTexts = Pick<DemoRule, 'consequence' | 'likelyCause' | 'operatorAction'>
const foldInView = (tag: string, unit: string, thresholdS: number, texts: RuleTexts): DemoRule => ({
  tag, name: `${unit} fold in view`, measure: 'fold_horizon', comparison: 'below', threshold: thresholdS, deadband: 300,
  onDelay: { evaluations: FOLD_IN_VIEW_DELAYS.onDelayEvaluations }, offDelay: { evaluations: FOLD_IN_VIEW_DELAYS.offDelayEvaluations },
  priority: 'high', alarmClass: 'alarm', ...texts,
})

export const DEMO_RULES: readonly DemoRule[] = [
  { tag: 'TI-101', name: 'R-100 reactor temperature high', measure: 'value', comparison: 'above', threshold: 400, deadband: 2, onDelay: 10, offDelay: 60,
    priority: 'urgent', alarmClass: 'alarm', consequence: 'Runaway on the hot branch: over-temperature and pressure relief.',
    likelyCause: 'The reactor has ignited to its hot operating state.', operatorAction: 'Start the reactor high-temperature procedure: full cooling, stop the feed.' },
  slowingDown('TI-101', 'R-100', 'The reactor\'s cool operating state', 'Check the cooling-water supply temperature and jacket fouling; prepare to reduce feed per procedure.'),
  foldInView('TI-101', 'R-100', 1200, { consequence: 'Ignition to the hot branch within the projected horizon.',
    likelyCause: 'Cooling capacity falling toward the ignition point.', operatorAction: 'Lower the cooling-water temperature or reduce feed per procedure before the projected time.' }),
  { tag: 'AI-201', name: 'D-200 VFA high', measure: 'value', comparison: 'above', threshold: 60, deadband: 3, onDelay: 60, offDelay: 60,
    priority: 'high', alarmClass: 'alarm', consequence: 'Digester souring: methane production collapses.',
    likelyCause: 'Methanogens washing out at short retention time.', operatorAction: 'Reduce the feed flow per procedure and check the alkalinity dosing.' },
  { tag: 'AI-202', name: 'D-200 pH low', measure: 'value', comparison: 'below', threshold: 6.6, deadband: 0.05, onDelay: 60, offDelay: 60,
    priority: 'high', alarmClass: 'alarm', consequence: 'Acid digester: biology inhibited, recovery takes weeks.',
    likelyCause: 'Volatile fatty acids accumulating faster than they are consumed.', operatorAction: 'Reduce the feed flow and start alkalinity dosing per procedure.' },
  slowingDown('FI-203', 'D-200', 'The digester\'s methane production', 'Check the feed flow trend and retention time; plan a feed reduction per procedure.'),
  { tag: 'EI-301', name: 'B-300 bus voltage low', measure: 'value', comparison: 'below', threshold: 0.75, deadband: 0.01, onDelay: 10, offDelay: 30,
    priority: 'urgent', alarmClass: 'alarm', consequence: 'Voltage collapse at the load bus.',
    likelyCause: 'Demand beyond the nose of the P–V curve.', operatorAction: 'Shed load or raise reactive support per the grid operator\'s instructions.' },
  slowingDown('EI-301', 'B-300', 'The load-bus voltage', 'Check the demand trend and reactive reserve; warn the grid operator per procedure.'),
  foldInView('EI-301', 'B-300', 900, { consequence: 'Voltage collapse within the projected horizon.',
    likelyCause: 'Demand rising toward the maximum transferable power.', operatorAction: 'Arrange load reduction or reactive support with the grid operator before the projected time.' }),
  { tag: 'TI-401', name: 'T-400 feed temperature high', measure: 'value', comparison: 'above', threshold: 55, deadband: 1, onDelay: 60, offDelay: 60,
    priority: 'medium', alarmClass: 'alarm', consequence: 'Off-specification feed to downstream units.',
    likelyCause: 'Heater control fault.', operatorAction: 'Check the heater and its controller; switch to manual per procedure.' },
  { tag: 'LI-402', name: 'T-400 feed level low', measure: 'value', comparison: 'below', threshold: 20, deadband: 5, onDelay: 60, offDelay: 60,
    priority: 'medium', alarmClass: 'alarm', consequence: 'Feed pumps lose suction.',
    likelyCause: 'Inflow lost or outflow valve stuck open.', operatorAction: 'Check the inflow and outflow valves; reduce the draw per procedure.' },
  slowingDown('TI-401', 'T-400', 'The feed-tank temperature loop', 'Check the temperature controller tuning and the heater.'),
  slowingDown('LI-402', 'T-400', 'The feed-tank level loop', 'Check the level controller and valves.'),
]

export const DEMO_ROUTE = { name: 'On-call engineer (high and urgent)', email: 'oncall@harrowgate.example', minPriority: 'high' as Priority }

/** The demo's time to respond by priority (invented for the demo plant, like its rationale texts). */
const DEMO_TIME_TO_RESPOND_S: Record<Priority, number> = { urgent: 300, high: 900, medium: 1800, low: 3600 }

/** A demo rule's columns for one tag (delays given in evaluations become seconds for its period). */
export function demoRuleColumns(r: DemoRule, tag: { id: number, unitId: number, samplePeriodS: number }) {
  const seconds = (delay: DemoRule['onDelay']) =>
    typeof delay === 'number' ? delay : delay.evaluations * evaluationIntervalS(defaultIndicatorSettings(tag.samplePeriodS), tag.samplePeriodS)
  return {
    targetKind: 'tag' as const, tagId: tag.id, unitId: tag.unitId, name: r.name, measure: r.measure, comparison: r.comparison,
    threshold: r.threshold, deadband: r.deadband ?? 0, onDelayS: seconds(r.onDelay), offDelayS: seconds(r.offDelay),
    priority: r.priority, alarmClass: r.alarmClass, consequence: r.consequence, likelyCause: r.likelyCause,
    operatorAction: r.operatorAction,
    timeToRespondS: DEMO_TIME_TO_RESPOND_S[r.priority],
  }
}

/** Creates the demo rules and route once; rules edited in the app keep their edits. */
export async function seedDemoAlarmRules(tx: DbTransaction, siteId: number): Promise<void> {
  const tagRows = await tx.select().from(tags)
    .where(and(eq(tags.siteId, siteId), inArray(tags.code, [...new Set(DEMO_RULES.map(r => r.tag))])))
  const byCode = new Map(tagRows.map(t => [t.code, t]))
  const rows = DEMO_RULES.flatMap((r) => {
    const tag = byCode.get(r.tag)
    return tag ? [{ siteId, ...demoRuleColumns(r, tag) }] : []
  })
  if (rows.length > 0) await tx.insert(alarmRules).values(rows).onConflictDoNothing()
  const [route] = await tx.select({ id: notificationRoutes.id, name: notificationRoutes.name }).from(notificationRoutes)
    .where(and(eq(notificationRoutes.siteId, siteId), eq(notificationRoutes.email, DEMO_ROUTE.email)))
  if (!route) await tx.insert(notificationRoutes).values({ siteId, ...DEMO_ROUTE })
  // Installs seeded before routes had names: name it, unless an admin already did.
  else if (!route.name) await tx.update(notificationRoutes).set({ name: DEMO_ROUTE.name }).where(eq(notificationRoutes.id, route.id))
}
