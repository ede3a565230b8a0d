// How large the overview tiles are drawn, chosen per workstation: compact for a laptop, standard
// for a desk screen, wall for a display read from across the room.
export const TILE_DENSITIES = ['compact', 'standard', 'wall'] as const
export type TileDensity = typeof TILE_DENSITIES[number]

/** The smallest width a tile may shrink to, per density (tiles grow to fill the row). */
export const TILE_MIN_REM: Record<TileDensity, number> = { compact: 14, standard: 18, wall: 26 }
