import { eq, inArray } from 'drizzle-orm'
import type { AlarmMailFacts } from '#shared/notifications/alarmMail'
import { MEASURE_LABELS } from '#shared/notifications/alarmMail'
import type { AlarmClass, Priority } from '#shared/alarms/vocabulary'
import { alarmRules, alarms, sites, tags, units } from '../../db/schema'
import type { DbExecutor } from '../../utils/db'

/** The alarm's own page: its facts and every event of the occurrence (docs/design.md §D5). */
export const alarmLink = (publicUrl: string, id: number) => `${publicUrl.replace(/\/$/, '')}/alarms/${id}`

/** Everything a message about these alarms says, read in one query. */
export async function loadAlarmMailFacts(db: DbExecutor, ids: number[], publicUrl: string): Promise<AlarmMailFacts[]> {
  if (ids.length === 0) return []
  const rows = await db.select({ alarm: alarms, rule: alarmRules, site: sites, unit: units, tag: tags })
    .from(alarms)
    .innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
    .innerJoin(sites, eq(sites.id, alarms.siteId))
    .innerJoin(units, eq(units.id, alarms.unitId))
    .leftJoin(tags, eq(tags.id, alarms.tagId))
    .where(inArray(alarms.id, ids))
  return rows.map(({ alarm, rule, site, unit, tag }) => {
    const context = alarm.context as { trend?: AlarmMailFacts['trend'], fold?: AlarmMailFacts['fold'] }
    return {
      alarmId: alarm.id,
      priority: alarm.priority as Priority,
      alarmClass: alarm.alarmClass as AlarmClass,
      siteName: site.name,
      timeZone: site.timeZone,
      unitCode: unit.code,
      unitName: unit.name,
      tagCode: tag?.code ?? null,
      tagDescription: tag?.description ?? null,
      engineeringUnit: tag?.engineeringUnit ?? null,
      ruleName: rule.name,
      measureLabel: MEASURE_LABELS[alarm.measure] ?? alarm.measure,
      comparison: alarm.comparison as 'above' | 'below',
      threshold: alarm.threshold,
      value: alarm.activatedValue,
      raisedAt: alarm.raisedAt.toISOString(),
      activatedAt: alarm.activatedAt.toISOString(),
      activationCount: alarm.activationCount,
      latestValue: alarm.lastValue,
      standing: alarm.state !== 'normal',
      trend: context.trend ?? null,
      fold: context.fold ?? { kind: 'none' },
      consequence: rule.consequence,
      likelyCause: rule.likelyCause,
      operatorAction: rule.operatorAction,
      link: alarmLink(publicUrl, alarm.id),
    }
  })
}
