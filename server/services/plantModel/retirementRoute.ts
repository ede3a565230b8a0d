import { createError, defineEventHandler, type H3Event } from 'h3'
import { idParamsSchema } from '#shared/schemas/fields'
import { writeAudit, clientAddress } from '../../utils/audit'
import { requireCapability } from '../../utils/auth'
import { changeContext } from '../../utils/changeContext'
import { useDb, type DbTransaction } from '../../utils/db'
import { validParams } from '../../utils/validation'
import { alignAlarmsWithRetirement } from '../alarms/retirementAlarms'
import { plantHttpError } from './errors'
import { setSiteRetired } from './sites'
import { setTagRetired } from './tags'
import { setUnitRetired } from './units'

const SETTERS = {
  site: (tx: DbTransaction, id: number, retired: boolean) =>
    setSiteRetired(tx, id, retired).then(r => r && { row: r.site, changed: r.changed }),
  unit: (tx: DbTransaction, id: number, retired: boolean) =>
    setUnitRetired(tx, id, retired).then(r => r && { row: r.unit, changed: r.changed }),
  tag: (tx: DbTransaction, id: number, retired: boolean) =>
    setTagRetired(tx, id, retired).then(r => r && { row: r.tag, changed: r.changed }),
}

/**
 * The six retire/restore routes differ only in what they touch: engineers only, the change, the
 * open alarms it takes out of (or back into) service, and its audit record (before and after) in
 * one transaction, 404 for an unknown id.
 */
export function plantRetirementRoute(kind: keyof typeof SETTERS, retired: boolean) {
  return defineEventHandler(async (event: H3Event) => {
    const user = await requireCapability(event, 'configure')
    const { id } = await validParams(event, idParamsSchema)
    return useDb().transaction(async (tx) => {
      const result = await SETTERS[kind](tx, id, retired).catch((err) => { throw plantHttpError(err) })
      if (!result) throw createError({ statusCode: 404, message: `${kind[0]!.toUpperCase()}${kind.slice(1)} ${id} not found` })
      const alarmsMoved = await alignAlarmsWithRetirement(tx, { kind, id, code: result.row.code }, retired, changeContext(user.id))
      await writeAudit(tx, { userId: user.id, action: `${kind}.${retired ? 'retire' : 'restore'}`, target: result.row.code, detail: { id, changed: result.changed, alarmsMoved }, address: clientAddress(event) })
      return result.row
    })
  })
}
