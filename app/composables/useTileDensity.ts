import type { TileDensity } from '~/utils/tileDensity'

/** The tile density of this workstation (app/utils/tileDensity.ts), remembered in this browser. */
export function useTileDensity() {
  // Read after mount: the server cannot see localStorage, and reading it during hydration would
  // leave the server-rendered default on screen with a mismatch.
  return useLocalStorage<TileDensity>('brinkline.tileDensity', 'standard', { initOnMounted: true })
}
