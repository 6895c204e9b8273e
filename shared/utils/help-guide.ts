// The troubleshooting guide (/help): what to check and what to change when a rig misbehaves, in
// Tiltwright's own words. The /help page, the ticket form's suggestions and the staff's stock
// replies all read these entries (docs/tickets.md, "The guide"). Numbers marked "common
// practice" are the hobby trade's usual starting points, not measurements of one rig.

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

/** The last caution of every entry: the school's rules come first. */
export const GUIDE_SCHOOL_RULES
  = 'Follow your school\'s own safety rules; they come first, and your teacher decides.'

const UNPLUG
  = 'Unplug the servo (or switch off its supply) before you put your hands near the lever arm '
    + 'or the pushrod. A powered servo can move without warning and pinch fingers.'
const STALL
  = 'A servo pushing against an end stop draws its stall current and gets hot. Switch off '
    + 'straight away if it hums against a stop, and let a hot servo cool before touching it.'
const SOLDER
  = 'Solder only where your school allows it, with eye protection, good air flow and the iron '
    + 'in its stand; let joints cool before you touch them.'
const BALLS
  = 'Small steel balls are a choking hazard: keep them away from young children and count them '
    + 'back in at the end of the lesson.'
const SWING
  = 'With new gains the beam can swing hard. Keep your hands clear of the linkage while the loop '
    + 'runs, and nudge the ball with a pencil or a ruler, never your fingers.'

const cautions = (...list: string[]) => [...list, GUIDE_SCHOOL_RULES]

export const HELP_GUIDE: readonly GuideEntry[] = [
  {
    slug: 'ball-not-sensed',
    title: 'The ball is not sensed',
    symptom:
      'The reading stays stuck at 0 or at its top value (1023 on the kit\'s 10-bit ADC) '
      + 'wherever the ball is, or it only changes in a few spots along the track.',
    keywords: [
      'not sensed',
      'not detected',
      'does not detect',
      'cannot see the ball',
      'no reading',
      'reading stays',
      'stuck at 0',
      'stuck at zero',
      'reads 0',
      'reads zero',
      '1023',
      'full scale',
      'conduct',
      'rusty',
      'rust',
      'painted',
      'plated',
      'oxidised',
      'oxidized',
      'dirty rails',
      'rail contact',
      'rails',
      'contact',
    ],
    check: [
      'Is the ball bare steel? A plated, painted, lacquered or rusty ball does not conduct. '
      + 'Test it with a multimeter on its resistance range, probes on two sides of the ball: a '
      + 'bare ball reads a few ohms at most.',
      'Are the rails clean and shiny along their whole length? Finger grease, dust and dull '
      + 'grey oxide stop the ball making contact.',
      'Does the ball touch both rails at once? It must bridge the gap. Look along the track at '
      + 'eye level: the rails should be parallel and the ball should sit on both.',
      'Are the rail wires firmly on their terminals, and is the wiper (the rail the ball reads '
      + 'from) on the pin the firmware reads?',
      'Slide the ball slowly by hand from one end of the track to the other: does the reading '
      + 'climb steadily? Then the sensor works and the trouble was contact.',
    ],
    change: [
      'Use the steel ball from the kit, or any bare, clean bearing ball of the same size.',
      'Clean the rails with a lint-free cloth and isopropyl alcohol; rub off dull oxide with a '
      + 'fine abrasive pad, then wipe again. Clean the ball the same way.',
      'Bend or re-seat a rail so the gap is even all the way along (the kit\'s rails are 10 mm '
      + 'apart for its 19 mm ball).',
      'Re-seat or re-solder a loose rail wire, then calibrate again in the Gain Planner.',
    ],
    cautions: cautions(UNPLUG, BALLS, SOLDER),
  },
  {
    slug: 'jumpy-readings',
    title: 'The readings jump around',
    symptom:
      'The position reading flickers or jumps by tens of counts while the ball sits still, and '
      + 'the beam twitches with it.',
    keywords: [
      'jumpy',
      'jumps',
      'jumping',
      'flicker',
      'flickers',
      'unstable reading',
      'readings jump',
      'noisy reading',
      'noisy readings',
      'spikes',
      'glitch',
      'random values',
      'bounce',
      'contact bounce',
      'loose wire',
      'averaging',
      'filter',
      'noise',
    ],
    check: [
      'Does the ball rock or bounce on the rails? A ball that lifts off one rail for a moment '
      + 'gives a spike each time (contact bounce).',
      'Wiggle each sensor wire gently with the power off, then on the bench with the rig '
      + 'switched on but the servo unplugged: a jump when you touch a wire means a loose joint '
      + 'or connector.',
      'Does the firmware read the track once per loop, with no averaging? One raw reading '
      + 'carries all the electrical noise.',
      'Does the loop read the sensor faster than it settles? If the firmware switches the ADC '
      + 'between channels or powers the rails just before reading, the first reading is often '
      + 'wrong.',
      'Are the servo\'s wires bundled tightly along the sensor\'s wires? The servo\'s pulses can '
      + 'couple into them.',
    ],
    change: [
      'Clean the rails and the ball (see "The ball is not sensed") so the contact is steady.',
      'Re-make any loose joint or connector; keep sensor wires short and away from the servo '
      + 'lead.',
      'Average several readings each loop: 4 to 8 is common practice at the kit\'s 50 Hz loop. '
      + 'A median of 3 readings removes single spikes.',
      'Throw away the first reading after switching ADC channels, or wait a short moment before '
      + 'reading (tens of microseconds is common practice).',
      'A 100 nF capacitor from the sensor\'s signal pin to ground is common practice for '
      + 'smoothing; fit it only if your teacher agrees.',
    ],
    cautions: cautions(UNPLUG, SOLDER),
  },
  {
    slug: 'servo-buzz',
    title: 'The servo buzzes or jitters',
    symptom:
      'The servo hums, buzzes or twitches even when the ball is nearly still, and may get warm.',
    keywords: [
      'buzz',
      'buzzes',
      'buzzing',
      'hum',
      'humming',
      'jitter',
      'jittery',
      'twitch',
      'twitching',
      'chatter',
      'whine',
      'servo noise',
      'servo noisy',
      'servo hot',
      'servo warm',
      'hot servo',
      'shaking',
      'vibrates',
      'vibrating',
      'deadband',
      'dead band',
    ],
    check: [
      'Look at the derivative gain (Kd). The D term multiplies how fast the reading changes, '
      + 'so it turns every bit of sensor noise into servo movement. A large Kd with a noisy '
      + 'sensor is the usual cause.',
      'Does the firmware filter the derivative? The Gain Planner\'s firmware constants include '
      + 'a derivative filter; a plain difference of two readings has none.',
      'Check the supply while the servo moves: a supply that sags (a weak battery, a thin USB '
      + 'lead) makes the servo and the readings wobble together. The kit\'s TW-S20 servo draws '
      + 'up to 2.5 A when it stalls: it wants the 6 V 3 A bench supply, not a laptop\'s USB '
      + 'port.',
      'Watch the servo horn closely when the ball is centred: small back-and-forth steps mean '
      + 'the servo is hunting around its deadband, the smallest change it reacts to.',
    ],
    change: [
      'Fix jumpy readings first (see "The readings jump around"): less noise in means less '
      + 'buzz out.',
      'Lower Kd in steps of about 20 %, then check the rig still settles without swinging.',
      'Add or strengthen the derivative filter: a filter N between 5 and 20 is common '
      + 'practice; a lower N smooths more but reacts later. The Gain Planner shows what it does '
      + 'to the predicted response.',
      'Give the servo its own supply sized for its stall current, with its ground joined to the '
      + 'controller\'s ground.',
      'Only send the servo a new position when it differs from the last one by more than a '
      + 'tiny step (1 or 2 µs of pulse width is common practice), so it stops hunting.',
    ],
    cautions: cautions(STALL, UNPLUG),
  },
  {
    slug: 'oscillates',
    title: 'The rig keeps swinging and never settles',
    symptom:
      'The ball rolls past the setpoint, back again, and keeps going to and fro; the swings '
      + 'stay the same size or grow.',
    keywords: [
      'oscillates',
      'oscillating',
      'oscillation',
      'keeps swinging',
      'swinging',
      'swings',
      'back and forth',
      'to and fro',
      'overshoot',
      'overshoots',
      'never settles',
      'does not settle',
      'will not settle',
      'wont settle',
      'unstable',
      'wobbles',
      'rocking',
      'backlash',
      'free play',
      'too slow',
    ],
    check: [
      'Compare the gains in the firmware with the Gain Planner\'s suggestion for this rig: '
      + 'swinging usually means too little derivative (Kd) for the proportional gain (Kp).',
      'Check the loop rate. The kit\'s firmware runs at 50 Hz; a loop slowed by printing to '
      + 'the serial monitor every pass, or by a delay(), reacts too late and swings.',
      'Unplug the servo, hold the horn still and rock the beam gently: any free play before the '
      + 'lever moves (backlash) lets the ball roll before the servo can push back.',
      'Check the servo in the planner: a servo slower than the gains need (the planner warns '
      + 'about it) always lags behind the ball.',
      'Are the rig\'s measurements in the planner the real ones? A lever in a different hole '
      + 'than the one entered changes everything.',
    ],
    change: [
      'Raise Kd in steps of about 20 %, or lower Kp by the same amount, and save a tuning sheet '
      + 'each time with how it behaved.',
      'Take slow work (printing, delays) out of the loop so it keeps its rate; print every '
      + 'tenth pass if you need to watch numbers.',
      'Tighten the horn screw and the pushrod ends; replace a worn pushrod or a cracked horn.',
      'For a gentler beam move the lever to the inner hole (12 mm), enter that in the planner '
      + 'and plan again.',
    ],
    cautions: cautions(SWING, UNPLUG),
  },
  {
    slug: 'drifts',
    title: 'The ball settles, but off centre',
    symptom:
      'The ball comes to rest and stays there, but always a little to one side of the setpoint.',
    keywords: [
      'drifts',
      'drifting',
      'drift',
      'off centre',
      'off center',
      'off the setpoint',
      'off to one side',
      'to one side',
      'not centred',
      'not centered',
      'not in the middle',
      'offset',
      'steady error',
      'steady state error',
      'level',
      'integral',
      'ki',
    ],
    check: [
      'Unplug the servo, set the horn to its centre position and look at the beam: is it level? '
      + 'A phone\'s spirit-level app on the beam helps. A beam that tilts at servo centre pulls '
      + 'the ball to one side.',
      'Check the calibration: put the ball at the middle of the track and compare the position '
      + 'the firmware reports with your ruler. A few millimetres off means the calibration '
      + 'offset is wrong.',
      'Check whether the firmware has an integral term (Ki). A PD loop alone always leaves a '
      + 'small steady error when the beam is not perfectly level or the ball rolls unevenly.',
    ],
    change: [
      'Level the beam at servo centre: move the horn one spline tooth, or adjust the pushrod '
      + 'length, then trim the firmware\'s centre pulse width in small steps.',
      'Calibrate again in the Gain Planner with readings at known positions, and paste the new '
      + 'offset into the firmware.',
      'Add a little Ki (the planner\'s PID mode suggests one) together with a windup limit, so '
      + 'the integral cannot grow without bound while the ball is held or at an end.',
    ],
    cautions: cautions(UNPLUG, SWING),
  },
  {
    slug: 'goes-quiet',
    title: 'The controller goes quiet after a while',
    symptom:
      'The rig balances for a few minutes, then the servo goes limp or the controller stops '
      + 'responding; sometimes it starts again by itself.',
    keywords: [
      'goes quiet',
      'stops responding',
      'stopped responding',
      'stops working',
      'stopped working',
      'freezes',
      'frozen',
      'hangs',
      'goes dead',
      'goes limp',
      'dies',
      'turns off',
      'switches off',
      'shuts off',
      'resets',
      'restarts',
      'reboots',
      'after a while',
      'after a few minutes',
      'minutes',
      'sleep',
      'watchdog',
      'power bank',
      'brown out',
      'brownout',
    ],
    check: [
      'Open the serial monitor: does the start-up message appear again? Then the board is '
      + 'resetting, from a watchdog or a dip in its supply.',
      'Look in the firmware for a watchdog, an idle timeout, sleep or power-saving mode: some '
      + 'boards and example sketches put the controller to sleep when nothing seems to happen.',
      'Is the rig powered from a USB power bank? Many switch themselves off when the current '
      + 'stays low for a while (below about 50 to 100 mA for some tens of seconds is common).',
      'Does it happen when the servo hits an end stop or works hard? A stalling servo (the '
      + 'kit\'s TW-S20 draws up to 2.5 A) can drag the supply low enough to reset the board (a '
      + 'brown-out).',
    ],
    change: [
      'Keep the watchdog, but make sure the loop resets it every pass and never blocks longer '
      + 'than its timeout; remove any idle-sleep or power-saving code.',
      'Power the rig from a mains adapter, or a power bank with an "always on" mode.',
      'Give the servo its own supply sized for its stall current, with a shared ground, and '
      + 'keep the beam off its end stops (limit the servo\'s travel in the firmware).',
    ],
    cautions: cautions(STALL, UNPLUG),
  },
  {
    slug: 'noisy-setpoint-knob',
    title: 'The setpoint knob is touchy or noisy',
    symptom:
      'Turning the setpoint knob makes the ball jump, or the ball wanders while nobody touches '
      + 'the knob.',
    keywords: [
      'knob',
      'setpoint knob',
      'turn the knob',
      'turning the knob',
      'move the knob',
      'potentiometer',
      'pot',
      'dial',
      'touchy',
      'too sensitive',
      'setpoint jumps',
      'setpoint noisy',
      'setpoint moves',
      'scratchy',
      'crackly',
    ],
    check: [
      'Watch the knob\'s raw reading on the serial monitor without touching it: it should not '
      + 'move by more than a count or two.',
      'Turn it slowly from end to end: jumps or drop-outs in one spot mean a worn track in the '
      + 'potentiometer.',
      'Check how often the firmware reads the knob and whether a new setpoint goes straight to '
      + 'the loop: a sudden setpoint step kicks the derivative term and jolts the beam.',
    ],
    change: [
      'Replace a worn potentiometer (the kit\'s is 10 kΩ, linear).',
      'Read the knob less often than the track (5 to 10 times a second is plenty, common '
      + 'practice) and smooth it with an average of several readings.',
      'Ignore changes smaller than a dead band of 2 to 4 counts, so the setpoint holds still.',
      'Limit how fast the setpoint may move, for example a few centimetres per second, and let '
      + 'the D term act on the ball\'s position rather than on the error.',
    ],
    cautions: cautions(UNPLUG, SOLDER),
  },
  {
    slug: 'reads-backwards',
    title: 'The track reads backwards',
    symptom:
      'The loop pushes the ball away from the setpoint instead of towards it: the ball runs to '
      + 'one end and sits against the end stop.',
    keywords: [
      'backwards',
      'backward',
      'reversed',
      'wrong way',
      'wrong direction',
      'opposite direction',
      'runs away',
      'runs to the end',
      'rolls to the end',
      'goes to the end',
      'sits at the end',
      'end stop',
      'pushes the ball away',
      'negative slope',
      'slope is negative',
    ],
    check: [
      'Move the ball by hand from the servo end to the far end and watch the reported position: '
      + 'does it go up or down?',
      'Look at the Gain Planner\'s calibration fit: a negative slope means the track counts '
      + 'from the other end than the firmware expects.',
      'Check the rail-end wires: if the two ends that carry the supply were swapped during '
      + 'wiring, the reading runs backwards.',
    ],
    change: [
      'Either swap the two rail-end wires on the controller, or flip the sign in the firmware\'s '
      + 'calibration; do one of them, not both.',
      'Calibrate again in the Gain Planner and check the slope now comes out positive.',
      'Test with the servo unplugged first: moving the ball towards an end should make the '
      + 'firmware ask to tilt the beam back towards the middle.',
    ],
    cautions: cautions(STALL, UNPLUG, SOLDER),
  },
]

// ── Matching a ticket's words to entries ─────────────────────────────────────────────────────

/** Words too common to tell entries apart; left out of both the keywords and the text. */
const STOP_WORDS = new Set([
  'a', 'an', 'the', 'is', 'are', 'it', 'its', 'to', 'of', 'and', 'or', 'on', 'in', 'at', 'my',
  'our', 'we', 'i', 'me', 'this', 'that', 'just', 'then', 'there', 'very', 'so', 'be', 'was',
  'with', 'for', 'after',
])

/** A word's rough stem, the same for "buzz", "buzzes" and "buzzing" or "settle" and "settles". */
function stem(word: string) {
  let w = word
  for (const suffix of ['ing', 'ion', 'ed', 'es', 'ly', 's', 'e', 'y']) {
    if (w.endsWith(suffix) && w.length - suffix.length >= 3) {
      w = w.slice(0, -suffix.length)
      break
    }
  }
  // "stopp" (stopped) and "stop", "runn" (running) and "run" meet.
  return w.replace(/(.)\1$/, '$1')
}

/** Lower case, letters and digits only, contractions joined ("won't" → "wont"), stemmed. */
function terms(text: string): string[] {
  return text
    .toLowerCase()
    .replace(/['’]/g, '')
    .split(/[^\p{L}\p{N}]+/u)
    .filter(w => w && !STOP_WORDS.has(w))
    .map(stem)
}

/** A phrase's words appear in order with at most this many other words between two of them. */
const PHRASE_GAP = 2

function containsPhrase(text: string[], phrase: string[]) {
  for (let start = 0; start < text.length; start++) {
    if (text[start] !== phrase[0]) continue
    let at = start
    let k = 1
    while (k < phrase.length) {
      const next = text.indexOf(phrase[k]!, at + 1)
      if (next < 0 || next - at - 1 > PHRASE_GAP) break
      at = next
      k++
    }
    if (k === phrase.length) return true
  }
  return false
}

const PHRASES = HELP_GUIDE.map(e => [...new Set(e.keywords.map(k => terms(k).join(' ')))]
  .filter(Boolean))
/** How many entries share a keyword: a word several entries use says less about each. */
const SHARED = new Map<string, number>()
for (const list of PHRASES) for (const p of list) SHARED.set(p, (SHARED.get(p) ?? 0) + 1)

/** The least score an entry needs to be suggested: one specific word, or a strong phrase. */
export const GUIDE_MATCH_THRESHOLD = 1

/** How strongly a text points at each entry: each keyword it contains counts its number of
 *  words, divided by the number of entries that share the keyword. */
export function guideScores(text: string): { entry: GuideEntry, score: number }[] {
  const words = terms(text)
  return HELP_GUIDE.map((entry, i) => ({
    entry,
    score: PHRASES[i]!.reduce((sum, p) => {
      const phrase = p.split(' ')
      return containsPhrase(words, phrase) ? sum + phrase.length / SHARED.get(p)! : sum
    }, 0),
  }))
}

/** The entries whose keywords a ticket's text mentions, best match first (at most `limit`). */
export function suggestGuideEntries(text: string, limit = 3): GuideEntry[] {
  const max = Math.max(0, Math.floor(limit))
  return guideScores(text)
    .map((s, order) => ({ ...s, order }))
    .filter(s => s.score >= GUIDE_MATCH_THRESHOLD)
    .sort((a, b) => b.score - a.score || a.order - b.order)
    .slice(0, max)
    .map(s => s.entry)
}

export const guideEntry = (slug: GuideSlug) => HELP_GUIDE.find(e => e.slug === slug)!

const bullets = (list: readonly string[]) => list.map(s => `- ${s}`).join('\n')

/** An entry as a stock reply's text, ending with a link to its place in /help. */
export function guideReplyText(entry: GuideEntry, baseUrl = ''): string {
  const parts = [
    `Here is what usually causes this ("${entry.title}" in our troubleshooting guide), and `
    + 'what to try.',
    `Check, in this order:\n${bullets(entry.check)}`,
    `Then change, one thing at a time:\n${bullets(entry.change)}`,
  ]
  if (entry.cautions.length) parts.push(`Take care:\n${bullets(entry.cautions)}`)
  parts.push(
    'Tell us what you found, with a photo or a short video if you can, and we will take it '
    + 'from there.',
    `The same steps in the troubleshooting guide: ${baseUrl}/help#${entry.slug}`,
  )
  return parts.join('\n\n')
}
