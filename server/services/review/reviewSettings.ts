import { eq } from 'drizzle-orm'
import { DEFAULT_INCIDENT_WINDOW_S } from '#shared/alarms/reviewVocabulary'
import type { AlertOutcome } from '#shared/alarms/reviewVocabulary'
import { unfollowedAlertsOf } from '#shared/alarms/earlyWarningRecord'
import { alarms, alertOutcomes, incidentAlarms, siteReviewSettings } from '../../db/schema'
import type { Db, DbExecutor } from '../../utils/db'
import { writeAudit } from '../../utils/audit'
import type { ReviewActor } from './incidentActions'
import { incidentMembers } from './incidentReads'
import { ReviewInputError } from './reviewErrors'
import { reviewSite } from './reviewSite'

/** The site's review settings (the default window where none was set). */
export async function reviewSettings(db: Db, siteId: number | undefined) {
  const site = await reviewSite(db, siteId)
  const [row] = await db.select().from(siteReviewSettings).where(eq(siteReviewSettings.siteId, site.id))
  return { siteId: site.id, incidentWindowS: row?.incidentWindowS ?? DEFAULT_INCIDENT_WINDOW_S, isDefault: !row }
}

export async function saveReviewSettings(db: Db, actor: ReviewActor, input: { siteId: number, incidentWindowS: number }) {
  const before = await reviewSettings(db, input.siteId)
  return db.transaction(async (tx) => {
    await tx.insert(siteReviewSettings).values({ siteId: input.siteId, incidentWindowS: input.incidentWindowS, updatedBy: actor.userId })
      .onConflictDoUpdate({
        target: siteReviewSettings.siteId,
        set: { incidentWindowS: input.incidentWindowS, updatedBy: actor.userId, updatedAt: new Date() },
      })
    await writeAudit(tx, { userId: actor.userId, action: 'review.settings', target: `site ${input.siteId}`, address: actor.address,
      detail: {
        siteId: input.siteId, before: { incidentWindowS: before.incidentWindowS }, after: { incidentWindowS: input.incidentWindowS },
      } })
    return { siteId: input.siteId, incidentWindowS: input.incidentWindowS, isDefault: false }
  })
}

/** An alert a limit alarm followed in its incident counts as a warning given; it takes no mark. */
async function refuseFollowedAlert(tx: DbExecutor, alarmId: number): Promise<void> {
  const holding = await tx.select({ incidentId: incidentAlarms.incidentId }).from(incidentAlarms).where(eq(incidentAlarms.alarmId, alarmId))
  for (const { incidentId } of holding) {
    const members = await incidentMembers(tx, incidentId)
    if (!unfollowedAlertsOf(members).some(m => m.alarmId === alarmId)) {
      throw new ReviewInputError('id', 409, `alarm ${alarmId} was followed by a limit alarm in incident ${incidentId}: it counts as a warning given, not as false or averted`)
    }
  }
}

/** Marks an early-warning alert false or averted (null clears the mark). Only slowing-down alerts no limit alarm followed take one. */
export async function markAlertOutcome(db: Db, actor: ReviewActor, alarmId: number, input: { outcome: AlertOutcome | null, note: string }) {
  return db.transaction(async (tx) => {
    const [alarm] = await tx.select({ measure: alarms.measure }).from(alarms).where(eq(alarms.id, alarmId))
    if (!alarm) throw new ReviewInputError('id', 404, `alarm ${alarmId} does not exist`)
    if (alarm.measure !== 'early_warning') throw new ReviewInputError('id', 400, `alarm ${alarmId} is not a slowing-down alert`)
    if (input.outcome !== null) await refuseFollowedAlert(tx, alarmId)
    const [before] = await tx.select().from(alertOutcomes).where(eq(alertOutcomes.alarmId, alarmId))
    if (input.outcome === null) await tx.delete(alertOutcomes).where(eq(alertOutcomes.alarmId, alarmId))
    else {
      const values = { outcome: input.outcome, note: input.note, markedBy: actor.userId, markedAt: new Date() }
      await tx.insert(alertOutcomes).values({ alarmId, ...values }).onConflictDoUpdate({ target: alertOutcomes.alarmId, set: values })
    }
    await writeAudit(tx, { userId: actor.userId, action: 'alert.outcome', target: `alarm ${alarmId}`, address: actor.address,
      detail: { alarmId, before: { outcome: before?.outcome ?? null, note: before?.note ?? '' }, after: { outcome: input.outcome, note: input.note } } })
    return { alarmId, outcome: input.outcome, note: input.note }
  })
}
