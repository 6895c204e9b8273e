// The servo as the firmware drives it: a pulse every frame, written in whole degrees or whole
// microseconds, ignored when it changes by less than the deadband. Defaults are common practice
// for hobby servos (1500 µs centre, about 1000 µs for 90°, a 50 Hz frame), not a datasheet.
import type { Rig, ServoResolution } from './schema'

const DEG = Math.PI / 180

export const SERVO_DEFAULTS = {
  centerUs: 1500,
  usPerDeg: 1000 / 90,
  resolution: 'microsecond' as ServoResolution,
  deadbandUs: 0,
  frameHz: 50,
}

export interface Actuator {
  centerUs: number
  /** Pulse width per radian of horn, µs/rad. */
  usPerRad: number
  resolution: ServoResolution
  /** The smallest step the firmware can write, rad. */
  stepRad: number
  /** Command changes smaller than this are ignored by the servo, rad. */
  deadbandRad: number
  frameHz: number
}

export function actuatorOf(rig: Rig): Actuator {
  const usPerDeg = rig.servoUsPerDeg ?? SERVO_DEFAULTS.usPerDeg
  const resolution = rig.servoResolution ?? SERVO_DEFAULTS.resolution
  return {
    centerUs: rig.servoCenterUs ?? SERVO_DEFAULTS.centerUs,
    usPerRad: usPerDeg / DEG,
    resolution,
    stepRad: resolution === 'degree' ? DEG : DEG / usPerDeg,
    deadbandRad: ((rig.servoDeadbandUs ?? SERVO_DEFAULTS.deadbandUs) / usPerDeg) * DEG,
    frameHz: rig.servoFrameHz ?? SERVO_DEFAULTS.frameHz,
  }
}
