import { gatewayTraffic } from '../../../services/gateways/gatewayTraffic'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const db = useDb()
  const [list, traffic] = await Promise.all([listGateways(db), gatewayTraffic(db, 24)])
  return list.map((g) => {
    const hours = traffic.get(g.id) ?? []
    return { ...g, hourly: hours, samplesLastHour: hours.at(-1)?.accepted ?? 0 }
  })
})
