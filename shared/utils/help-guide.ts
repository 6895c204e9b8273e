// The troubleshooting guide (/help): what to check and what to change when a rig misbehaves, in
// Tiltwright's own words. The /help page, the ticket form's suggestions and the staff's stock
// replies all read these entries. CONTENT TO BE WRITTEN (contract stub): slugs and shape are fixed.

export const GUIDE_SLUGS = [
  'ball-not-sensed',
  'jumpy-readings',
  'servo-buzz',
  'oscillates',
  'drifts',
  'goes-quiet',
  'noisy-setpoint-knob',
  'reads-backwards',
] as const
export type GuideSlug = (typeof GUIDE_SLUGS)[number]

export interface GuideEntry {
  slug: GuideSlug
  /** The symptom as a builder would say it: "The ball is not sensed". */
  title: string
  /** One or two sentences: what the builder sees. */
  symptom: string
  /** Words that point at this entry when they appear in a ticket's subject or message. */
  keywords: readonly string[]
  /** What to look at, in order. */
  check: readonly string[]
  /** What to change, in order. */
  change: readonly string[]
  /** Where hands go near the linkage or the power: plain cautions (empty when none apply). */
  cautions: readonly string[]
}

export const HELP_GUIDE: readonly GuideEntry[] = []

/** The entries whose keywords a ticket's text mentions, best match first (at most `limit`). */
export function suggestGuideEntries(text: string, limit = 3): GuideEntry[] {
  void text
  void limit
  return []
}

/** An entry as a stock reply's text, ending with a link to its place in /help. */
export function guideReplyText(entry: GuideEntry, baseUrl = ''): string {
  return `${entry.title}\n\n${baseUrl}/help#${entry.slug}`
}
