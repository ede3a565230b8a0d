import type { Ref } from 'vue'

/**
 * The site list, with the given site id set to the first site while it is unset (0 or empty),
 * so a form for one site starts on a site without a pick for the common single-site plant.
 */
export async function useSitesWithDefault(siteId: Ref<number | undefined> | Ref<number>) {
  const { data: sites } = await useFetch('/api/sites', { key: 'sites' })
  watchEffect(() => {
    const first = sites.value?.[0]?.id
    if (!siteId.value && first !== undefined) siteId.value = first
  })
  return sites
}
