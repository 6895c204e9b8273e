// The build space's one e-mail: to the teacher, when the kits of a paid order become rigs.
// Builders get no mail (they have no address).
import { renderMail } from './layout'

export function buildSpaceReadyMail(
  name: string,
  space: { number: string, rigs: number },
  url: string,
) {
  const rigs = space.rigs === 1 ? '1 rig is' : `${space.rigs} rigs are`
  return renderMail(`The build space of order ${space.number} is ready`, name, [
    {
      paragraph:
        `Each kit of order ${space.number} now has a rig in its build space: ${rigs} ready for `
        + 'your class. Name and group them, then make a join code for your students.',
    },
    { link: { label: 'Open the progress board', url } },
    {
      paragraph:
        'Students join with the code and a username of their choosing; they need no e-mail '
        + 'address, and Tiltwright sends them none.',
    },
  ])
}
