// The troubleshooting guide (shared/utils/help-guide.ts): every entry is complete, the ones
// where hands go near the linkage carry their cautions, a ticket's words find the right entries,
// and a stock reply made from an entry reads as one (docs/tickets.md, "The guide").
import { describe, expect, it } from 'vitest'
import {
  GUIDE_SCHOOL_RULES,
  GUIDE_SLUGS,
  HELP_GUIDE,
  guideEntry,
  guideReplyText,
  guideScores,
  suggestGuideEntries,
  type GuideSlug,
} from '../../shared/utils/help-guide'
import { MESSAGE_MAX } from '../../shared/utils/tickets'

const slugsOf = (text: string, limit?: number) =>
  suggestGuideEntries(text, limit).map(e => e.slug)

describe('the guide\'s entries', () => {
  it('has one entry per slug, in the slugs\' order', () => {
    expect(HELP_GUIDE.map(e => e.slug)).toEqual([...GUIDE_SLUGS])
  })

  it.each([...GUIDE_SLUGS])('%s says what you see, what to check and what to change', (slug) => {
    const e = guideEntry(slug)
    expect(e.title.length).toBeGreaterThan(10)
    expect(e.symptom.length).toBeGreaterThan(30)
    expect(e.check.length).toBeGreaterThanOrEqual(3)
    expect(e.change.length).toBeGreaterThanOrEqual(3)
    expect(e.keywords.length).toBeGreaterThanOrEqual(5)
    for (const line of [...e.check, ...e.change]) expect(line).toMatch(/^[A-Z].*[.)?]$/)
  })

  it('gives no two entries the same title', () => {
    expect(new Set(HELP_GUIDE.map(e => e.title)).size).toBe(HELP_GUIDE.length)
  })

  // Every entry has someone's hands on the rig: each ends with the school's rules.
  it.each([...GUIDE_SLUGS])('%s ends its cautions with the school\'s own rules', (slug) => {
    expect(guideEntry(slug).cautions.at(-1)).toBe(GUIDE_SCHOOL_RULES)
  })

  // The fixes that send hands to the lever, the pushrod, the horn or the rails while the rig may
  // have power say to unplug first.
  it.each([
    'ball-not-sensed',
    'servo-buzz',
    'oscillates',
    'drifts',
    'goes-quiet',
    'reads-backwards',
  ] as GuideSlug[])('%s says to unplug before hands go near the linkage', (slug) => {
    const words = guideEntry(slug).cautions.join(' ')
    expect(words).toMatch(/Unplug the servo/)
    expect(words).toMatch(/lever arm|linkage/)
  })

  it('warns about stall current where a servo can stall or hum against a stop', () => {
    for (const slug of ['servo-buzz', 'goes-quiet', 'reads-backwards'] as const)
      expect(guideEntry(slug).cautions.join(' ')).toMatch(/stall current/)
  })

  it('warns about the small steel balls where the ball comes off the beam', () => {
    expect(guideEntry('ball-not-sensed').cautions.join(' ')).toMatch(/choking hazard/)
  })

  it('warns about soldering wherever a change may need the iron', () => {
    for (const slug of ['jumpy-readings', 'noisy-setpoint-knob', 'reads-backwards'] as const)
      expect(guideEntry(slug).cautions.join(' ')).toMatch(/Solder only where your school/)
  })

  it('marks the trade\'s rule-of-thumb numbers as common practice', () => {
    const numbered = HELP_GUIDE.flatMap(e => e.change).filter(s => /\d+ (to|and) \d+/.test(s))
    expect(numbered.length).toBeGreaterThan(2)
    expect(numbered.filter(s => /common practice/.test(s)).length).toBeGreaterThan(2)
  })
})

describe('suggestGuideEntries', () => {
  it.each([
    ['the ball just runs to the end and sits there', 'reads-backwards'],
    ['Servo makes a buzzing noise', 'servo-buzz'],
    ['It stopped responding after 10 minutes', 'goes-quiet'],
    ['Ball keeps swinging back and forth, never settles', 'oscillates'],
    ['It balances but always off centre, a bit to the left', 'drifts'],
    ['The reading stays at 1023 wherever the ball is', 'ball-not-sensed'],
    ['My ball is painted, is that a problem?', 'ball-not-sensed'],
    ['the readings are jumping all over the place', 'jumpy-readings'],
    ['When I turn the knob the ball jumps', 'noisy-setpoint-knob'],
    ['The loop pushes the ball away, the calibration has a negative slope', 'reads-backwards'],
    ['servo gets hot and twitches', 'servo-buzz'],
    ['Controller resets when the power bank is used', 'goes-quiet'],
  ])('"%s" finds %s first', (text, slug) => {
    expect(slugsOf(text)[0]).toBe(slug)
  })

  it('ignores case and punctuation', () => {
    expect(slugsOf('SERVO!!! BUZZING???')).toEqual(slugsOf('servo buzzing'))
    expect(slugsOf('won\'t settle')[0]).toBe('oscillates')
  })

  it('matches word forms: buzz, buzzes, buzzing', () => {
    for (const w of ['buzz', 'buzzes', 'buzzing']) expect(slugsOf(`it ${w}`)[0]).toBe('servo-buzz')
  })

  it.each([
    'asdf qwerty zxcv',
    'hello',
    'Thanks, all good now!',
    '',
    '!!! ???',
  ])('suggests nothing for "%s"', (text) => {
    expect(suggestGuideEntries(text)).toEqual([])
  })

  it('does not suggest on the words every ticket uses', () => {
    expect(slugsOf('the ball and the rig')).toEqual([])
  })

  it('never answers more than the limit, best first', () => {
    const text = 'servo buzzes, readings jump, ball keeps swinging, drifts off centre, knob is '
      + 'touchy, resets after a few minutes, runs to the end, rails are rusty'
    expect(slugsOf(text, 8).length).toBeGreaterThan(5)
    expect(slugsOf(text, 2)).toEqual(slugsOf(text, 8).slice(0, 2))
    expect(slugsOf(text)).toHaveLength(3)
    expect(slugsOf(text, 0)).toEqual([])
    expect(slugsOf(text, -1)).toEqual([])
    const scores = new Map(guideScores(text).map(s => [s.entry.slug, s.score]))
    const ranked = slugsOf(text, 8).map(s => scores.get(s)!)
    expect(ranked).toEqual([...ranked].sort((a, b) => b - a))
  })

  it('breaks ties by the guide\'s order', () => {
    // One word each, equally strong: the guide's order decides.
    expect(slugsOf('rusty and twitching', 5)).toEqual(['ball-not-sensed', 'servo-buzz'])
    expect(slugsOf('twitching and rusty', 5)).toEqual(['ball-not-sensed', 'servo-buzz'])
  })
})

describe('guideReplyText', () => {
  it.each([...GUIDE_SLUGS])('makes a stock reply from %s', (slug) => {
    const e = guideEntry(slug)
    const text = guideReplyText(e, 'https://tiltwright.test')
    expect(text.startsWith(`Here is what usually causes this ("${e.title}"`)).toBe(true)
    expect(text).not.toMatch(/^(Hello|Hi|Dear)/)
    for (const line of [...e.check, ...e.change, ...e.cautions]) expect(text).toContain(`- ${line}`)
    expect(text.indexOf(e.check[0]!)).toBeLessThan(text.indexOf(e.change[0]!))
    expect(text.trimEnd().endsWith(`https://tiltwright.test/help#${slug}`)).toBe(true)
    // A stock reply and a message must fit the message limit.
    expect(text.length).toBeLessThanOrEqual(MESSAGE_MAX)
  })

  it('links relative to the site when no base address is given', () => {
    expect(guideReplyText(guideEntry('drifts'))).toMatch(/ \/help#drifts$/)
  })
})
