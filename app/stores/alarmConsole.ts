// Client state of the alarm console that outlives the page: which alarms the operator has ticked
// (kept while they glance at a tag and come back) and whether new urgent alarms should sound.
const SOUND_KEY = 'brinkline.alarmSound'

export const useAlarmConsoleStore = defineStore('alarmConsole', () => {
  const selectedIds = ref<number[]>([])
  // Off by default (a browser must not make noise unasked); remembered on this workstation.
  const soundOn = ref(false)
  const hasSelection = computed(() => selectedIds.value.length > 0)
  const isSelected = (id: number) => selectedIds.value.includes(id)
  const toggle = (id: number) => {
    selectedIds.value = isSelected(id) ? selectedIds.value.filter(x => x !== id) : [...selectedIds.value, id]
  }
  const selectOnly = (ids: number[]) => { selectedIds.value = [...ids] }
  /** Drops ticks of alarms that are no longer in the list (acknowledged elsewhere, cleared). */
  const keepOnly = (ids: number[]) => { selectedIds.value = selectedIds.value.filter(id => ids.includes(id)) }
  const clear = () => { selectedIds.value = [] }
  // Read after mount: the server cannot see localStorage, and a value read during hydration
  // would leave the server-rendered "off" on screen.
  const restoreSound = () => { soundOn.value = localStorage.getItem(SOUND_KEY) === 'true' }
  const setSound = (on: boolean) => {
    soundOn.value = on
    localStorage.setItem(SOUND_KEY, String(on))
  }
  return { selectedIds, soundOn, hasSelection, isSelected, toggle, selectOnly, keepOnly, clear, restoreSound, setSound }
})
