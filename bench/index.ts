// `npm run bench`: every benchmark in one run, each printing its own figures.
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { pathToFileURL } from 'node:url'

const BENCHES: [file: string, exportName: string][] = [
  ['light.bench.ts', 'runLightBench'],
  ['feed.bench.ts', 'runFeedBench'],
  ['planning.bench.ts', 'runPlanningBench'],
  ['outlook.bench.ts', 'runOutlookBench'],
  ['moon.bench.ts', 'runMoonBench'],
  ['rotations.bench.ts', 'runRotationsBench']
]

for (const [file, name] of BENCHES) {
  const path = resolve(import.meta.dirname, file)
  if (!existsSync(path)) continue
  console.log(`\n== ${file} ==`)
  const mod = await import(pathToFileURL(path).href) as Record<string, () => Promise<void> | void>
  await mod[name]!()
}
