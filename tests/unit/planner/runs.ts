// Logged runs made by the planner's own simulation of a rig whose plant gain and servo lag are
// known, written as the firmware's serial log would print them (RUN_LOG_SNIPPET), with seeded
// Gaussian noise on the reading.
import { plantOf, simulate, type Gains, type Rig } from '../../../shared/utils/planner'
import { gaussian, seeded } from './noise'

export interface LogOptions {
  /** RMS noise on the reading, ADC counts. */
  noiseCounts?: number
  seed?: number
  duration?: number
  columns?: 'all' | 'no-command'
}

export function simulatedLog(truth: Rig, gains: Gains, o: LogOptions = {}): string {
  const p = plantOf(truth)
  const ks = p.countsPerMeter
  const sim = simulate(truth, gains, {
    duration: o.duration ?? 10,
    initialPosition: 0.3 * p.sensorLength,
    setpoint: 0.6 * p.sensorLength,
    setpointTime: 1,
    subSteps: 20,
    outputEvery: 5,
  })
  const random = gaussian(seeded(o.seed ?? 1))
  const noise = o.noiseCounts ?? 0
  const rows = [o.columns === 'no-command'
    ? 'setpoint_counts,time_s,position_counts'
    : 'time_s,position_counts,setpoint_counts,command_deg']
  const samples = Math.floor((sim.t.length - 1) / 4)
  for (let k = 0; k < samples; k++) {
    const reading = Math.floor(sim.x[4 * k]! * ks) + Math.round(noise * random())
    const setpoint = Math.round(sim.setpoint[4 * k]! * ks)
    const command = ((sim.command[4 * (k + 1)]! * 180) / Math.PI).toFixed(2)
    const t = (k * p.period).toFixed(3)
    rows.push(o.columns === 'no-command'
      ? `${setpoint},${t},${reading}`
      : `${t},${reading},${setpoint},${command}`)
  }
  return rows.join('\n')
}
