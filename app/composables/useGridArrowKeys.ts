// Arrow keys move focus between the tiles of a grid the way the eye reads it: left/right to the
// neighbour, up/down to the tile in the row above/below nearest in x. Tab still walks the page,
// Enter opens the focused tile (it is a link). Tiles are found by `data-tile` inside `container`.
export function useGridArrowKeys(container: Ref<HTMLElement | undefined>) {
  // On the whole page, so the keys work before any tile was clicked: with nothing focused, the
  // first key focuses the first tile. Keys meant for a field or a control are left alone.
  useEventListener(globalThis.document, 'keydown', (event: KeyboardEvent) => {
    if (!['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown', 'Home', 'End'].includes(event.key)) return
    if (!container.value) return
    const tiles = [...container.value.querySelectorAll<HTMLElement>('[data-tile]')]
    const current = tiles.indexOf(document.activeElement as HTMLElement)
    if (current < 0) {
      const idle = !document.activeElement || document.activeElement === document.body
      if (idle && tiles[0]) {
        event.preventDefault()
        tiles[0].focus()
      }
      return
    }
    const target = nextTile(tiles, current, event.key)
    if (target) {
      event.preventDefault()
      target.focus()
    }
  })
}

function nextTile(tiles: HTMLElement[], current: number, key: string): HTMLElement | undefined {
  if (key === 'Home') return tiles[0]
  if (key === 'End') return tiles.at(-1)
  if (key === 'ArrowRight') return tiles[current + 1]
  if (key === 'ArrowLeft') return tiles[current - 1]
  const from = tiles[current]!.getBoundingClientRect()
  const below = key === 'ArrowDown'
  const candidates = tiles.map(t => ({ t, r: t.getBoundingClientRect() }))
    .filter(({ r }) => (below ? r.top >= from.bottom - 1 : r.bottom <= from.top + 1))
  if (!candidates.length) return undefined
  // The nearest row first, then the tile nearest in x within it.
  const rowTop = below ? Math.min(...candidates.map(c => c.r.top)) : Math.max(...candidates.map(c => c.r.top))
  const row = candidates.filter(c => Math.abs(c.r.top - rowTop) < 2)
  const centre = from.left + from.width / 2
  row.sort((a, b) => Math.abs(a.r.left + a.r.width / 2 - centre) - Math.abs(b.r.left + b.r.width / 2 - centre))
  return row[0]!.t
}
