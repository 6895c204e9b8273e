// What each result the Gain Planner shows means, in plain words; the page renders it as its
// glossary and the results link to each entry by id (#glossary-<id>).
// A first version written with the page; the model's document (docs/planner-model.md) is the
// reference for the method behind each term.
export const PLANNER_GLOSSARY: { term: string, id: string, meaning: string }[] = [
  {
    term: 'Overshoot',
    id: 'overshoot',
    meaning: 'How far past the new setpoint the ball rolls, as a share of the step.',
  },
  {
    term: 'Settling time (2 %)',
    id: 'settling-time',
    meaning: 'When the ball stays within 2 % of the step for good.',
  },
  {
    term: 'Phase margin',
    id: 'phase-margin',
    meaning:
      'How much extra lag the loop can take before it swings for ever, measured on the loop '
      + 'the firmware runs sample by sample. Aim for 30° or more.',
  },
  {
    term: 'Gain margin',
    id: 'gain-margin',
    meaning:
      'How much all the gains could grow before the loop swings for ever. Aim for 6 dB (the '
      + 'gains doubled) or more. An unstable loop has no margin: the planner says why instead.',
  },
  {
    term: 'Extra delay tolerated',
    id: 'extra-delay',
    meaning:
      'How much later than planned each reading could reach the servo (a slow ADC read, a busy '
      + 'loop) before the loop becomes unstable.',
  },
  {
    term: 'Sensitivity peak Ms',
    id: 'sensitivity-peak',
    meaning:
      'How much the loop can magnify a bump or a wobble at its worst frequency. 1.3 to 2 is '
      + 'usual; above 2 the rig rings after every knock.',
  },
  {
    term: 'Designed for ζ · ωn',
    id: 'designed-for',
    meaning:
      'The damping ζ (from the overshoot you asked for) and the speed ωn (from the settling time) '
      + 'the suggestion was worked out for.',
  },
  {
    term: 'Smooth stand-in',
    id: 'continuous-margins',
    meaning:
      'The same loop drawn as if it were continuous, with the sampling treated as a delay. Its '
      + 'margins are a little kinder than the real sampled loop, so the planner warns on the '
      + 'sampled ones.',
  },
]
