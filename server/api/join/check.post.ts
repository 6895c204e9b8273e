// A student types the join code: who it lets them join, and a username idea. Wrong codes are
// counted per address (JOIN_THROTTLE): a class behind one address is not held up by its own
// joins, only by guessing.
import { joinCheckSchema } from '../../../shared/schemas/build'
import type { JoinCheckReply } from '../../../shared/types/build'

export default defineEventHandler(async (event): Promise<JoinCheckReply> => {
  const { code } = await readBodyAs(event, joinCheckSchema)
  const { order } = await withJoinThrottle(event, () => liveJoinCode(useDb(), code))
  const space = await spaceRefOf(useDb(), order)
  return {
    space: {
      schoolName: space.schoolName,
      teacherName: space.teacherName,
      orderNumber: space.orderNumber,
    },
    suggestedUsername: await freeUsername(useDb()),
  }
})
