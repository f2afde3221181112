import { seedReady } from '../plugins/1.seed'

// Holds the first requests until the demo seeding (if any) has finished.
export default defineEventHandler(async () => {
  await seedReady.promise
})
