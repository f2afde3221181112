import { ColdQuerySchema, computeColdFigures } from '../core/cold/index'
// Cold figures for an air temperature and wind (docs/api.md, "Cold"): wind chill, frostbite band and
// the 4-hour work/warm-up schedule, with the cautions that go with them. Any signed-in role.
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = readQueryAs(event, ColdQuerySchema)
  return computeColdFigures(query)
})
