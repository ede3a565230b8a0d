import tailwindConfig from '../../tailwind.config'

// Canvas charts cannot use Tailwind classes: they read the same tokens from the one config, so a
// palette change in tailwind.config.ts reaches the charts too.
const colors = tailwindConfig.theme.extend.colors

export const CHART_COLORS = {
  grid: colors.surface.line,
  axis: colors.ink.muted,
  line: colors.ink.DEFAULT,
  trend: colors.accent.DEFAULT,
  faint: colors.ink.faint,
  band: colors.surface.sunken,
  warning: colors.status.warning,
  alarm: colors.status.alarm,
  priority: colors.priority,
} as const

/** `#rrggbb` with an alpha, for translucent fills. */
export function withAlpha(hex: string, alpha: number): string {
  const n = Number.parseInt(hex.slice(1), 16)
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`
}
