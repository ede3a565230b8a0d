import { describe, expect, it } from 'vitest'
import { applyLifecycleEvent, type AlarmPoint } from '../../../../shared/alarms/lifecycle'
import { ALARM_STATES, type AlarmState, type LifecycleEvent } from '../../../../shared/alarms/vocabulary'

const SOURCE = 'ANSI/ISA-18.2-2016 state-transition diagram (per docs/science.md §S7.2)'
const point = (state: AlarmState, conditionActive: boolean): AlarmPoint => ({ state, conditionActive })
const to = (from: AlarmPoint, event: LifecycleEvent) => {
  const t = applyLifecycleEvent(from, event)
  if (!t.ok) throw new Error(`${from.state} + ${event} refused: ${t.reason}`)
  return t
}

describe(`alarm lifecycle — ${SOURCE}`, () => {
  it('A → B on activation, and the operator is told', () => {
    const t = to(point('normal', false), 'activate')
    expect(t.to).toEqual(point('unacknowledged', true))
    expect(t.annunciates).toBe(true)
    expect(t.closes).toBe(false)
  })

  it('B → C on acknowledgement', () => {
    expect(to(point('unacknowledged', true), 'acknowledge').to).toEqual(point('acknowledged', true))
  })

  it('B → D when the condition returns before acknowledgement', () => {
    expect(to(point('unacknowledged', true), 'return').to).toEqual(point('rtn_unacknowledged', false))
  })

  it('C → A when an acknowledged alarm returns to normal, closing the occurrence', () => {
    const t = to(point('acknowledged', true), 'return')
    expect(t.to).toEqual(point('normal', false))
    expect(t.closes).toBe(true)
  })

  it('D → A when a returned alarm is acknowledged, closing the occurrence', () => {
    const t = to(point('rtn_unacknowledged', false), 'acknowledge')
    expect(t.to).toEqual(point('normal', false))
    expect(t.closes).toBe(true)
  })

  // [from memory] The diagram also lets a returned, unacknowledged alarm re-alarm (D → B).
  it('D → B when the condition comes back before acknowledgement [from memory]', () => {
    const t = to(point('rtn_unacknowledged', false), 'activate')
    expect(t.to).toEqual(point('unacknowledged', true))
    expect(t.annunciates).toBe(true)
  })

  const setAside = [
    { state: 'shelved', enter: 'shelve', exit: 'unshelve' },
    { state: 'suppressed', enter: 'suppress', exit: 'unsuppress' },
    { state: 'out_of_service', enter: 'remove_from_service', exit: 'return_to_service' },
  ] as const
  const conditionOf: Record<AlarmState, boolean> = {
    normal: false, unacknowledged: true, acknowledged: true, rtn_unacknowledged: false,
    shelved: true, suppressed: false, out_of_service: true,
  }

  for (const { state, enter, exit } of setAside) {
    it(`${state} (F/G/H) can be entered from every other state and keeps tracking the condition`, () => {
      for (const from of ALARM_STATES.filter(s => s !== state)) {
        const t = to(point(from, conditionOf[from]), enter)
        expect(t.to).toEqual(point(state, conditionOf[from]))
        expect(t.annunciates).toBe(false)
        expect(to(t.to, 'activate').to).toEqual(point(state, true))
        expect(to(point(state, true), 'return').to).toEqual(point(state, false))
      }
    })

    it(`${state} resumes evaluation on exit: active → unacknowledged, inactive → normal`, () => {
      const stillActive = to(point(state, true), exit)
      expect(stillActive.to).toEqual(point('unacknowledged', true))
      expect(stillActive.annunciates).toBe(true)
      const cleared = to(point(state, false), exit)
      expect(cleared.to).toEqual(point('normal', false))
      expect(cleared.closes).toBe(true)
    })

    it(`${exit} is refused unless the alarm is ${state}, naming the state it is in`, () => {
      const t = applyLifecycleEvent(point('acknowledged', true), exit)
      expect(t.ok).toBe(false)
      if (!t.ok) expect(t.reason).toContain('acknowledged')
      const again = applyLifecycleEvent(point(state, true), enter)
      expect(again.ok).toBe(false)
    })
  }

  it('refuses transitions the diagram does not have, with a reason naming the state', () => {
    const cases: [AlarmState, boolean, LifecycleEvent][] = [
      ['acknowledged', true, 'acknowledge'],
      ['normal', false, 'acknowledge'],
      ['normal', false, 'return'],
      ['rtn_unacknowledged', false, 'return'],
      ['unacknowledged', true, 'activate'],
      ['acknowledged', true, 'activate'],
      ['shelved', true, 'acknowledge'],
    ]
    for (const [state, active, event] of cases) {
      const t = applyLifecycleEvent(point(state, active), event)
      expect(t.ok, `${state} + ${event}`).toBe(false)
    }
    const ackTwice = applyLifecycleEvent(point('acknowledged', true), 'acknowledge')
    expect(ackTwice.ok || ackTwice.reason).toMatch(/this one is acknowledged/)
  })
})
