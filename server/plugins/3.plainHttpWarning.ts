import { plainHttpWarning } from '../utils/plainHttpWarning'

export default defineNitroPlugin(() => {
  const warning = plainHttpWarning(useRuntimeConfig().publicUrl)
  if (warning) console.warn(`[brinkline] ${warning}`)
})
