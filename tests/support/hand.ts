import { create, all, type BigNumber } from 'mathjs'

// Hand computations with mathjs's arbitrary-precision decimals (a general-purpose reference library
// from npm), independent of the product's engine. A mile is 1609.344 m and 1 km/h is 1/3.6 m/s
// (NIST SP 811, appendix B); published figures are truncated to three decimals (common practice).
const math = create(all, { number: 'BigNumber', precision: 64 })
const big = (x: string | number) => math.bignumber(String(x))
/** An exact decimal of the hand computations. */
export const decimal = big

/** Seconds after midnight of a time of day written hh:mm:ss.ffff. */
export function secondsOfDay(time: string): BigNumber {
  const [h, m, s] = time.split(':') as [string, string, string]
  return big(h).mul(3600).add(big(m).mul(60)).add(big(s))
}

export const truncated = (x: BigNumber, decimals = 3) => {
  const scale = big(10).pow(decimals)
  return x.mul(scale).floor().div(scale).toFixed(decimals)
}

/** Speed over a distance in metres in a time in seconds, as published in km/h and mph. */
export function speedOver(metres: string | number, seconds: BigNumber) {
  const ms = big(metres).div(seconds)
  return { kmh: truncated(ms.mul(3.6)), mph: truncated(ms.div('0.44704')) }
}

/** The two-way result: the distance over the mean of the two times. */
export const pairSpeed = (metres: string | number, t1: BigNumber, t2: BigNumber) =>
  speedOver(metres, t1.add(t2).div(2))

interface SheetReading { trapId: number, systemId: number, time: string }
interface SheetRun { direction: 'out' | 'back', readings: SheetReading[] }

/**
 * Times over a measured distance, by hand from a run sheet's times of day: the exit trap minus the
 * entry trap in the direction of the run, on one timing system.
 */
export function timesOver(runs: SheetRun[], entryTrapId: number, exitTrapId: number, systemId: number) {
  const at = (run: SheetRun, trapId: number) =>
    secondsOfDay(run.readings.find(r => r.trapId === trapId && r.systemId === systemId)!.time)
  return runs.map(run => (run.direction === 'out'
    ? at(run, exitTrapId).sub(at(run, entryTrapId))
    : at(run, entryTrapId).sub(at(run, exitTrapId))))
}

/**
 * The longest return time that still beats a record by the smallest step of the published figure,
 * under the mean of times: t2 ≤ 2d / V − t1, floored to the timing resolution.
 */
export function returnTargetByHand(
  metres: string,
  record: { speed: string, unit: 'km/h' | 'mph' },
  t1: BigNumber,
  decimals = 4,
) {
  // Exceed the record at its published decimals, in its own unit: one unit of the third decimal more.
  const over = big(record.speed).add('0.001')
  const needed = record.unit === 'mph' ? over.mul('0.44704') : over.div(3.6)
  const longest = big(metres).mul(2).div(needed).sub(t1)
  const scale = big(10).pow(decimals)
  return longest.mul(scale).floor().div(scale).toFixed(decimals)
}
