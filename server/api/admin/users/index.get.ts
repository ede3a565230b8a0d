import { listUsers } from '../../../services/accounts/users'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return listUsers(useDb())
})
