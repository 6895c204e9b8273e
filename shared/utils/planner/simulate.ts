// The drawn response (docs/planner-model.md §4): a nonlinear simulation of the rig as built.
//   ball     x'' = eta·g·sin(alpha), stopped (inelastically) at the beam ends
//   linkage  alpha(theta): exact lever geometry (default for a lever drive) or d/L_a·theta;
//            theta/N_g direct
//   servo    first-order lag tau_s towards the held command, speed limited to omega_max, command
//            clamped as the generated firmware does (±travel/2, or the lever linkage's fold point)
//   sensor   ADC counts: floor(x·k_s) clamped to [0, 2^bits − 1], read back at the count's centre
//   firmware the §5 controller at every sample, command written on the next tick and held,
//            integral held while the command is clamped (anti-windup)
//   soft start the command eased in over TW_SOFT_START samples, as the exported recipe does
//   actuator the pulse written in whole µs or whole degrees, taken by the servo only at its PWM
//            frame, and ignored when it moves less than the servo's deadband (actuatorOf)
// Within a hold the servo angle is known in closed form (slew phase, then exponential; piecewise
// where a servo frame falls inside the hold), so only the ball is integrated, by RK4 on sub-steps
// of T/subSteps.
import { actuatorOf } from './actuator'
import { filterTimeConstant } from './design'
import { softStartSamplesOf } from './firmware'
import {
  beamAngleRange,
  leverBeamAngle,
  leverGeometryOf,
  reachableServoRange,
  smallAngleBeamAngle,
} from './geometry'
import { plantOf } from './plant'
import { derivativeCoefficients } from './sampled'
import type { Discretization, Gains, Rig } from './schema'

export interface SimulateOptions {
  /** s; default 10. */
  duration?: number
  /** Ball start, m from the sensor's zero; default the middle of the sensor. */
  initialPosition?: number
  /** The nudge: ball speed at t = 0, m/s; default 0. */
  initialSpeed?: number
  /** A further nudge: extra ball speed (m/s) added at `time` (s). */
  nudge?: { time: number, speed: number } | null
  /** Setpoint before the change, m; default the start position. */
  initialSetpoint?: number
  /**
   * Setpoint after the change, m; default a quarter of the sensor past the start (or before it,
   * near the end).
   */
  setpoint?: number
  /** When the setpoint changes, s; default 0.5. */
  setpointTime?: number
  /** ADC quantisation; default true. */
  quantize?: boolean
  /** Servo travel and slew limits; default true. */
  limits?: boolean
  /** Lever linkage model; default 'exact'. Ignored for a direct drive. */
  linkage?: 'exact' | 'small-angle'
  discretization?: Discretization
  /** RK4 sub-steps per sample; default 20. */
  subSteps?: number
  /** Output every this many sub-steps; default 5. */
  outputEvery?: number
  /** Ease the command in as the exported recipe does (TW_SOFT_START); default true. */
  softStart?: boolean
  /** The servo's PWM frame, output steps and deadband (actuatorOf(rig)); default true. */
  actuator?: boolean
  /** What-ifs and the measured-run fit: scale the plant gain K_b; default 1. */
  kbScale?: number
  /** Scale the servo lag τ_s (and its slew limit); default 1. */
  servoLagScale?: number
  /** Extra whole samples of delay before the command reaches the servo; default 0. */
  extraDelaySamples?: number
}

export interface SimulationResult {
  /** s */
  t: number[]
  /** Ball position, m from the sensor's zero. */
  x: number[]
  /** rad */
  beamAngle: number[]
  /** rad */
  servoAngle: number[]
  /** m */
  setpoint: number[]
  /** Held servo command, rad. */
  command: number[]
  /** Ball speed, m/s. */
  speed: number[]
  events: {
    /** The command was clamped at ±travel/2 at least once. */
    travelSaturated: boolean
    /** The servo ran at its speed limit at least once. */
    slewLimited: boolean
    /** The ball reached a beam end. */
    hitEnd: boolean
    /** The linkage could not follow the servo and was held at its reach. */
    linkageLimited: boolean
    /** The sensor read 0 or full scale. */
    sensorOutOfRange: boolean
    /** The ball kept moving back and forth around the setpoint because of the servo's output
     *  steps or deadband (a limit cycle the linear model does not have). */
    hunting: boolean
  }
}

/** Servo angle a time t into a hold with command c, from theta0: slew-limited first-order lag. */
export function servoAngleAt(
  theta0: number,
  c: number,
  t: number,
  tau: number,
  slew: number,
): number {
  const gap = c - theta0
  const dir = gap >= 0 ? 1 : -1
  const mag = Math.abs(gap)
  const knee = tau * slew // beyond this gap the lag would ask for more than the slew limit
  if (mag > knee) {
    const tSlew = (mag - knee) / slew
    if (t <= tSlew) return theta0 + dir * slew * t
    return c - dir * knee * Math.exp(-(t - tSlew) / tau)
  }
  return c - gap * Math.exp(-t / tau)
}

/** The beam angle for a servo angle, and whether the lever was ever held at its reach. */
export function linkageOf(
  rig: Rig,
  model: 'exact' | 'small-angle' = 'exact',
): { alpha: (theta: number) => number, limited: () => boolean } {
  let limited = false
  const report = { limited: () => limited }
  if (rig.drive === 'direct') {
    const ng = rig.gearRatio ?? 1
    return { alpha: theta => theta / ng, ...report }
  }
  const g = leverGeometryOf(rig)
  if (model === 'small-angle') return { alpha: theta => smallAngleBeamAngle(theta, g), ...report }
  const plant = plantOf(rig)
  const [lo, hi] = reachableServoRange(g, Math.min(Math.PI, Math.max(plant.halfTravel, 0)))
  const alpha = (theta: number) => {
    let th = theta
    if (th > hi) {
      th = hi
      limited = true
    } else if (th < lo) {
      th = lo
      limited = true
    }
    return leverBeamAngle(th, g) ?? 0
  }
  return { alpha, ...report }
}

export function simulate(rig: Rig, gains: Gains, options: SimulateOptions = {}): SimulationResult {
  const plant = plantOf(rig)
  const T = plant.period
  const lagScale = options.servoLagScale ?? 1
  const tau = plant.servoLag * lagScale
  const limits = options.limits ?? true
  const slew = limits ? plant.slewLimit / lagScale : Infinity
  // The firmware's clamp (see firmwareConstants): the servo's travel, or the linkage's fold point.
  const range = beamAngleRange(rig)
  const usable = Math.min(Math.abs(range.maxAtServoAngle), Math.abs(range.minAtServoAngle))
  const half = limits ? usable : Infinity
  const quantize = options.quantize ?? true
  const subSteps = Math.max(1, Math.round(options.subSteps ?? 20))
  const outputEvery = Math.max(1, Math.round(options.outputEvery ?? 5))
  const h = T / subSteps
  const duration = options.duration ?? 10
  const ks = plant.countsPerMeter
  const fullScale = 2 ** rig.adcBits - 1
  const ag = plant.eta * plant.gravity * (options.kbScale ?? 1)
  const radius = rig.ballDiameter / 2
  const overhang = (rig.beamLength - plant.sensorLength) / 2
  const xMin = -overhang + radius
  const xMax = plant.sensorLength + overhang - radius

  const linkage = linkageOf(rig, options.linkage ?? 'exact')
  const alphaOf = linkage.alpha

  const x0 = options.initialPosition ?? plant.sensorLength / 2
  const r0 = options.initialSetpoint ?? x0
  let r1 = options.setpoint
  if (r1 === undefined) {
    const step = plant.sensorLength / 4
    r1 = x0 + step <= plant.sensorLength ? x0 + step : x0 - step
  }
  const tChange = options.setpointTime ?? 0.5
  const nudge = options.nudge ?? null

  const tf = filterTimeConstant(gains.kp, gains.kd, gains.n)
  const { a: da, b: db } = derivativeCoefficients(
    gains.kd,
    tf,
    T,
    options.discretization ?? 'backward-euler',
  )
  const kiT = gains.ki * T
  const onMeasurement = gains.derivativeOn === 'measurement'

  const out: SimulationResult = {
    t: [],
    x: [],
    beamAngle: [],
    servoAngle: [],
    setpoint: [],
    command: [],
    speed: [],
    events: {
      travelSaturated: false,
      slewLimited: false,
      hitEnd: false,
      linkageLimited: false,
      sensorOutOfRange: false,
      hunting: false,
    },
  }
  const record = (t: number, x: number, v: number, th: number, r: number, c: number) => {
    out.t.push(t)
    out.x.push(x)
    out.speed.push(v)
    out.servoAngle.push(th)
    out.beamAngle.push(alphaOf(th))
    out.setpoint.push(r)
    out.command.push(c)
  }

  // the actuator: output steps, deadband, and the servo's frame times
  const act = actuatorOf(rig)
  const useActuator = options.actuator ?? true
  const step = useActuator ? act.stepRad : 0
  const deadband = useActuator ? act.deadbandRad : 0
  const frame = useActuator ? 1 / act.frameHz : 0
  const written = (u: number) => (step > 0 ? Math.round(u / step) * step : u)
  const softStart = (options.softStart ?? true) ? softStartSamplesOf(rig.loopRate) : 0
  const delaySamples = Math.max(0, Math.round(options.extraDelaySamples ?? 0))
  const pending: number[] = Array.from({ length: delaySamples }, () => 0)

  let x = x0
  let v = options.initialSpeed ?? 0
  let th = 0
  let held = 0 // the pulse the firmware writes during this hold, as a servo angle
  let target = 0 // the pulse the servo is following (it takes a new one only at its frames)
  let D = 0
  let sPrev = Number.NaN // first sample starts the derivative without a kick
  let I = 0
  let n = 0
  let nudged = nudge === null
  const samples = Math.ceil(duration / T - 1e-9)
  const lastEvent = Math.max(tChange, nudge === null ? 0 : nudge.time)
  const settledFrom = lastEvent + (duration - lastEvent) / 2
  // servo pieces within one hold: [start time in the hold, angle there, target]
  const pieceStart: number[] = []
  const pieceTheta: number[] = []
  const pieceTarget: number[] = []
  const servoAt = (tt: number) => {
    let p = pieceStart.length - 1
    while (p > 0 && pieceStart[p]! > tt) p--
    return servoAngleAt(pieceTheta[p]!, pieceTarget[p]!, tt - pieceStart[p]!, tau, slew)
  }
  const take = (c: number) => {
    // the servo ignores a new pulse that moves less than its deadband from the one it follows
    if (Math.abs(c - target) >= deadband && c !== target) target = c
  }
  for (let k = 0; k < samples; k++) {
    const t0 = k * T
    // sample k
    const r = t0 < tChange ? r0 : r1
    let xm = x
    if (quantize) {
      let count = Math.floor(x * ks)
      if (count <= 0 || count >= fullScale) out.events.sensorOutOfRange = true
      count = Math.min(Math.max(count, 0), fullScale)
      xm = (count + 0.5) / ks
    }
    const e = r - xm
    const s = onMeasurement ? -xm : e
    if (Number.isNaN(sPrev)) sPrev = s
    D = da * D + db * (s - sPrev)
    sPrev = s
    const iNext = I + kiT * e
    let u = gains.kp * e + iNext + D
    if (Math.abs(u) > half) {
      out.events.travelSaturated = true
      // Integrate only when that drives the command back inside (conditional integration).
      if (Math.sign(e) !== Math.sign(u)) I = iNext
      u = Math.max(-half, Math.min(half, gains.kp * e + I + D))
    } else {
      I = iNext
    }
    if (n < softStart) {
      n += 1
      u = (u * n) / softStart
    }
    // the hold [kT, (k+1)T] under the command from the previous sample
    const c = held
    pieceStart.length = 0
    pieceTheta.length = 0
    pieceTarget.length = 0
    if (frame === 0) {
      target = c
      pieceStart.push(0)
      pieceTheta.push(th)
      pieceTarget.push(c)
    } else {
      // the servo's frames at whole multiples of 1/frameHz; the first inside this hold takes c
      pieceStart.push(0)
      pieceTheta.push(th)
      pieceTarget.push(target)
      let m = Math.ceil(t0 / frame - 1e-9)
      for (; m * frame < t0 + T - 1e-9; m++) {
        const at = m * frame - t0
        const thAt = servoAt(at)
        take(c)
        if (at <= 1e-12) {
          pieceTheta[0] = thAt
          pieceTarget[0] = target
        } else {
          pieceStart.push(at)
          pieceTheta.push(thAt)
          pieceTarget.push(target)
        }
      }
    }
    for (let p = 0; p < pieceStart.length; p++) {
      if (Math.abs(pieceTarget[p]! - pieceTheta[p]!) > tau * slew) out.events.slewLimited = true
    }
    const acc = (tt: number) => ag * Math.sin(alphaOf(servoAt(tt)))
    for (let j = 0; j < subSteps; j++) {
      const ta = j * h
      if (j % outputEvery === 0) record(t0 + ta, x, v, servoAt(ta), r, c)
      if (!nudged && nudge !== null && t0 + ta >= nudge.time) {
        v += nudge.speed
        nudged = true
      }
      const a1 = acc(ta)
      const a2 = acc(ta + h / 2)
      const a4 = acc(ta + h)
      // x'' = f(t) does not depend on x or v, so RK4's two midpoint stages coincide.
      x += h * v + (h * h * (a1 + 2 * a2)) / 6
      v += (h * (a1 + 4 * a2 + a4)) / 6
      if (x < xMin) {
        x = xMin
        if (v < 0) v = 0
        out.events.hitEnd = true
      } else if (x > xMax) {
        x = xMax
        if (v > 0) v = 0
        out.events.hitEnd = true
      }
    }
    th = servoAt(T)
    pending.push(written(u))
    held = pending.shift()!
  }
  record(samples * T, x, v, th, samples * T < tChange ? r0 : r1, held)
  out.events.linkageLimited = linkage.limited()
  out.events.hunting
    = useActuator
      && (step > 0 || deadband > 0)
      && hunts(out, ks, settledFrom, plant.sensorLength)
  return out
}

/**
 * The ball still wandering back and forth around the setpoint in the second half of the time
 * after the last change or nudge: at least two crossings, each side reached by more than an ADC
 * count, and a swing of at least half a millimetre but less than a twentieth of the track (a
 * larger swing is the loop itself swinging, not the servo's steps or deadband).
 */
function hunts(
  run: SimulationResult,
  countsPerMeter: number,
  from: number,
  trackLength: number,
): boolean {
  const count = 1 / countsPerMeter
  let side = 0
  let crossings = 0
  let lo = Infinity
  let hi = -Infinity
  for (let i = 0; i < run.t.length; i++) {
    if (run.t[i]! < from) continue
    const e = run.x[i]! - run.setpoint[i]!
    lo = Math.min(lo, e)
    hi = Math.max(hi, e)
    const now = e > count ? 1 : e < -count ? -1 : 0
    if (now !== 0 && now !== side) {
      if (side !== 0) crossings++
      side = now
    }
  }
  const spread = hi - lo
  return crossings >= 2 && spread >= Math.max(2 * count, 0.0005) && spread < trackLength / 20
}
