// The bring-up: the ordered first power-up of a rig with the planned constants, shown in the
// firmware panel and on the printed sheet.
// CONTRACT STUB: the steps' final words come with the bring-up work.
import type { FirmwareConstants } from './firmware'
import type { Gains, Rig } from './schema'

export interface BringUpStep {
  id: 'neutral' | 'direction' | 'p-only' | 'suggested'
  title: string
  /** What to do and what to look for, in plain words. */
  detail: string
  /** Where hands or the ball can get hurt; null when none. */
  caution: string | null
}

export function bringUpSteps(
  _rig: Rig,
  _gains: Gains,
  _firmware: FirmwareConstants,
): BringUpStep[] {
  return [
    { id: 'neutral', title: 'Check the servo neutral', detail: '', caution: null },
    { id: 'direction', title: 'Check the loop direction', detail: '', caution: null },
    { id: 'p-only', title: 'Try P only at a low gain', detail: '', caution: null },
    { id: 'suggested', title: 'Load the suggested gains', detail: '', caution: null },
  ]
}
