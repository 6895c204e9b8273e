// The planner's API is open to anyone and computes on demand: each address has an allowance
// per minute, counted in the database so that every instance shares it
// (server/utils/rate-limits.ts).
export default defineEventHandler(async (event) => {
  if (event.path.startsWith('/api/planner/')) await takeRateLimit(event, PLANNER_RATE_LIMIT)
})
