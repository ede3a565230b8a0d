// Client state of the alarm console that outlives the page: which alarms the operator has ticked
// (kept while they glance at a tag and come back) and whether new urgent alarms should sound.
export const useAlarmConsoleStore = defineStore('alarmConsole', () => {
  const selectedIds = ref<number[]>([])
  // Off by default (a browser must not make noise unasked); remembered on this workstation.
  const soundOn = useLocalStorage('brinkline.alarmSound', false)
  const hasSelection = computed(() => selectedIds.value.length > 0)
  const isSelected = (id: number) => selectedIds.value.includes(id)
  const toggle = (id: number) => {
    selectedIds.value = isSelected(id) ? selectedIds.value.filter(x => x !== id) : [...selectedIds.value, id]
  }
  const selectOnly = (ids: number[]) => { selectedIds.value = [...ids] }
  /** Drops ticks of alarms that are no longer in the list (acknowledged elsewhere, cleared). */
  const keepOnly = (ids: number[]) => { selectedIds.value = selectedIds.value.filter(id => ids.includes(id)) }
  const clear = () => { selectedIds.value = [] }
  return { selectedIds, soundOn, hasSelection, isSelected, toggle, selectOnly, keepOnly, clear }
})
