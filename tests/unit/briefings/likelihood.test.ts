import { describe, expect, it } from 'vitest'
import {
  LIKELIHOOD_SCALES, bandRangeText, formatPercent, likelihoodBand, scenarioCountText, shareWords, statementNumberText, statementSentence, wordingNumberProblem,
  type StatementFacts,
} from '../../../shared/utils/likelihood'

const five = LIKELIHOOD_SCALES['five-band']
const three = LIKELIHOOD_SCALES['three-band']

const facts = (over: Partial<StatementFacts> = {}): StatementFacts => ({
  kind: 'anywhere', value: 3 / 12, count: 3, scenarios: 12, members: 4, membersShowing: 2,
  event: 'gusts reach 20 m/s or more', areaName: 'Kaldor Pass', when: 'at 12 UTC 14 Nov 2031', ...over,
})

describe('likelihood scales', () => {
  it('cover [0, 1] without gaps or overlaps, in increasing order', () => {
    for (const scale of Object.values(LIKELIHOOD_SCALES)) {
      expect(scale.bands[0]!.lower).toBe(0)
      expect(scale.bands.at(-1)!.upper).toBe(1)
      for (let k = 1; k < scale.bands.length; k++) expect(scale.bands[k]!.lower).toBe(scale.bands[k - 1]!.upper)
    }
  })

  it('puts a boundary value in the higher band and 1 in the last band', () => {
    expect(likelihoodBand(five, 0.1).words).toBe('unlikely but possible')
    expect(likelihoodBand(five, 0.0999).words).toBe('very unlikely')
    expect(likelihoodBand(five, 0.65).words).toBe('likely')
    expect(likelihoodBand(five, 1).words).toBe('very likely')
    expect(likelihoodBand(five, 0).words).toBe('very unlikely')
    expect(likelihoodBand(three, 0.2).words).toBe('medium chance')
    expect(likelihoodBand(three, 0.6).words).toBe('high chance')
  })

  it('refuses values that are not probabilities', () => {
    expect(() => likelihoodBand(five, -0.01)).toThrow()
    expect(() => likelihoodBand(five, 1.01)).toThrow()
    expect(() => likelihoodBand(five, Number.NaN)).toThrow()
  })

  it('prints band ranges in whole percent', () => {
    expect(five.bands.map(bandRangeText)).toEqual(['0–10 %', '10–35 %', '35–65 %', '65–90 %', '90–100 %'])
  })
})

describe('numbers', () => {
  it('never rounds a non-zero probability to 0 % or a non-certain one to 100 %', () => {
    expect(formatPercent(0)).toBe('0 %')
    expect(formatPercent(1 / 720)).toBe('under 1 %')
    expect(formatPercent(719 / 720)).toBe('over 99 %')
    expect(formatPercent(1)).toBe('100 %')
    // 1/12 = 8.33…, 5/18 = 27.7…: rounded to whole percent.
    expect(formatPercent(1 / 12)).toBe('8 %')
    expect(formatPercent(5 / 18)).toBe('28 %')
  })

  it('counts scenarios and the members they come from', () => {
    expect(scenarioCountText(facts())).toBe('3 of 12 scenarios, from 2 of 4 members')
    expect(scenarioCountText(facts({ count: 0, value: 0, membersShowing: 0 }))).toBe('none of 12 scenarios')
    expect(scenarioCountText(facts({ kind: 'fraction', count: null, membersShowing: null }))).toBe('mean over 12 scenarios from 4 members')
  })

  it('words a share of an area without a likelihood band', () => {
    expect(shareWords(0)).toBe('none of the area')
    expect(shareWords(0.05)).toBe('small patches')
    expect(shareWords(0.5)).toBe('much of the area')
    expect(shareWords(0.9)).toBe('most of the area')
  })
})

describe('statement sentences', () => {
  it('say the words, the number, the count, the event, the area and the time', () => {
    expect(statementSentence(five, facts())).toBe(
      'Unlikely but possible (25 %, 3 of 12 scenarios, from 2 of 4 members) that gusts reach 20 m/s or more somewhere in Kaldor Pass at 12 UTC 14 Nov 2031.')
    expect(statementSentence(three, facts({ kind: 'areaMean', value: 9 / 12, count: 9, membersShowing: 4 }))).toBe(
      'High chance (75 %, 9 of 12 scenarios, from 4 of 4 members) that, averaged over Kaldor Pass, gusts reach 20 m/s or more at 12 UTC 14 Nov 2031.')
    expect(statementSentence(five, facts({ kind: 'fraction', value: 0.12, count: null, membersShowing: null }))).toBe(
      'Expected share of Kaldor Pass where gusts reach 20 m/s or more at 12 UTC 14 Nov 2031: 12 % (parts of the area; mean over 12 scenarios from 4 members).')
  })

  it('refuses a probability that does not match its count', () => {
    expect(() => statementSentence(five, facts({ value: 0.3 }))).toThrow(/does not equal/)
    expect(() => statementSentence(five, facts({ count: 13, value: 13 / 12 }))).toThrow()
  })

  it('accepts edited wording that keeps the numbers, and refuses a changed number or count', () => {
    const f = facts()
    expect(wordingNumberProblem('A one-in-four chance (25 %, 3 of 12 scenarios) of damaging gusts on the pass.', five, f)).toBeNull()
    expect(wordingNumberProblem('Unlikely but possible (10–35 % band): gusts over the pass.', five, f)).toBeNull()
    expect(wordingNumberProblem('No numbers at all.', five, f)).toBeNull()
    expect(wordingNumberProblem('About 40 % chance of gusts.', five, f)).toMatch(/says 40 %.*computed value is 25 %/)
    expect(wordingNumberProblem('Seen in 5 of 12 scenarios.', five, f)).toMatch(/5 of 12/)
    expect(wordingNumberProblem('From 2 of 4 members.', five, f)).toBeNull()
  })

  it('prints the table number from the facts', () => {
    expect(statementNumberText(facts())).toBe('25 % (3 of 12 scenarios, from 2 of 4 members)')
  })
})
