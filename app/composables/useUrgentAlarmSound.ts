// A short two-tone chime when an urgent alarm appears that was not in the list before. Generated
// with WebAudio (no audio file is fetched). The first list seen is the baseline: opening the page
// on a list with urgent alarms in it stays quiet, only new ones sound.
export function useUrgentAlarmSound(
  alarms: Ref<Array<{ id: number, priority: string, state: string }> | undefined>,
  enabled: Ref<boolean>,
) {
  let known: Set<number> | null = null
  let audio: AudioContext | null = null

  function chime() {
    audio ??= new AudioContext()
    const start = audio.currentTime
    for (const [i, frequency] of [880, 660].entries()) {
      const tone = audio.createOscillator()
      const gain = audio.createGain()
      tone.frequency.value = frequency
      gain.gain.setValueAtTime(0.2, start + i * 0.25)
      gain.gain.exponentialRampToValueAtTime(0.001, start + i * 0.25 + 0.22)
      tone.connect(gain).connect(audio.destination)
      tone.start(start + i * 0.25)
      tone.stop(start + i * 0.25 + 0.23)
    }
  }

  watch(alarms, (list) => {
    if (!list) return
    const urgent = list.filter(a => a.priority === 'urgent' && a.state === 'unacknowledged').map(a => a.id)
    const fresh = known ? urgent.filter(id => !known!.has(id)) : []
    known = new Set(list.map(a => a.id))
    if (fresh.length && enabled.value && import.meta.client) chime()
  }, { immediate: true })

  // Browsers only allow sound after a user gesture: the toggle click is one, so a test chime then
  // also unlocks the audio for later alarms.
  return { chime }
}
