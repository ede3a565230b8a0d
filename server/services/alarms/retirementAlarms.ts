// Open alarms of a retired tag, unit or site leave service with it: the pipeline no longer watches
// a retired tag, so an alarm left standing would never return to normal and would sit on lists
// and counts as if somebody should act (ISA-18.2 state H, out of service, is the state for an
// alarm whose equipment is out of use [common practice]). Restoring brings each such alarm back in
// line with its rule's mode; on return to service evaluation starts again from normal.
import { and, eq, isNull, ne } from 'drizzle-orm'
import type { AlarmState, RuleMode } from '#shared/alarms/vocabulary'
import { alarmRules, alarms } from '../../db/schema'
import type { DbTransaction } from '../../utils/db'
import type { ChangeContext } from '../../utils/changeContext'
import { modeEvent, transitionAlarm } from './alarmTransitions'

export interface RetiredScope {
  kind: 'tag' | 'unit' | 'site'
  id: number
  code: string
}

/** Alarms that belong to the scope itself (a unit's own rules, not its tags', which retire first). */
function inScope(scope: RetiredScope) {
  if (scope.kind === 'tag') return eq(alarms.tagId, scope.id)
  if (scope.kind === 'unit') return and(eq(alarms.unitId, scope.id), isNull(alarms.tagId))
  return and(eq(alarms.siteId, scope.id), isNull(alarms.unitId), isNull(alarms.tagId))
}

/** Moves the scope's open alarms out of service (retired) or in line with their rule (restored). */
export async function alignAlarmsWithRetirement(
  tx: DbTransaction, scope: RetiredScope, retired: boolean, ctx: ChangeContext,
): Promise<number> {
  const open = await tx.select({ alarm: alarms, mode: alarmRules.mode }).from(alarms)
    .innerJoin(alarmRules, eq(alarmRules.id, alarms.ruleId))
    .where(and(inScope(scope), ne(alarms.state, 'normal'))).orderBy(alarms.id).for('update', { of: alarms })
  let moved = 0
  for (const { alarm, mode } of open) {
    const event = retired ? modeEvent(alarm.state as AlarmState, 'out_of_service') : modeEvent(alarm.state as AlarmState, mode as RuleMode)
    if (!event) continue
    await transitionAlarm(tx, alarm, event, ctx, { comment: `${scope.kind} ${scope.code} ${retired ? 'retired' : 'restored'}` })
    moved++
  }
  return moved
}
