/** Hours of each lead time after the reference time (when the file gave one) or after the first valid time. */
export function leadHoursOf(run: { leadTimes: string[]; forecastPeriodsHours: number[] }): number[] {
  if (run.forecastPeriodsHours.length === run.leadTimes.length) return run.forecastPeriodsHours
  const t0 = Date.parse(run.leadTimes[0]!)
  return run.leadTimes.map((t) => (Date.parse(t) - t0) / 3600_000)
}
