// The time-coherence sentence of legends, area tables and briefing method texts.
import { describe, expect, it } from 'vitest'
import { NEGLIGIBLE_LEAD_CORRELATION, timeCoherenceSentence, typicalLeadSpacingHours } from '#shared/utils/timeCoherenceText'

describe('timeCoherenceSentence', () => {
  it('gives exp(−Δt/τ) for the typical spacing (closed form of the Ornstein–Uhlenbeck correlation)', () => {
    expect(timeCoherenceSentence(12, 6)).toContain(`about ${Math.exp(-0.5).toFixed(2)} from one lead time to the next`)
    expect(timeCoherenceSentence(12, 6)).toContain('hangs together in time')
  })
  it('calls the detail redrawn when the correlation is below the negligible level', () => {
    const tau = 6 / -Math.log(NEGLIGIBLE_LEAD_CORRELATION) - 0.01 // just under the level
    expect(timeCoherenceSentence(tau, 6)).toMatch(/practically redrawn/)
    expect(timeCoherenceSentence(tau + 0.02, 6)).toMatch(/keeps a correlation of about 0\.05/)
  })
  it('without coherent noise says each lead time was drawn separately', () => {
    expect(timeCoherenceSentence(null, 6)).toMatch(/drawn separately at each lead time/)
  })
})

describe('typicalLeadSpacingHours', () => {
  it('is the median gap between consecutive valid times', () => {
    expect(typicalLeadSpacingHours(['2031-11-14T06:00:00Z', '2031-11-14T12:00:00Z', '2031-11-14T15:00:00Z', '2031-11-14T21:00:00Z'])).toBe(6)
    expect(typicalLeadSpacingHours(['2031-11-14T06:00:00Z'])).toBeNull()
  })
})
