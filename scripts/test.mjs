// `npm test`: build the app once (the e2e tests run the built server), then every vitest project.
import { spawnSync } from 'node:child_process'

const env = { ...process.env, NO_COLOR: '1', FORCE_COLOR: '0' }
function run(cmd, args) {
  const started = Date.now()
  const result = spawnSync(cmd, args, { stdio: 'inherit', env })
  console.info(`[test] ${cmd} ${args.join(' ')}: exit ${result.status} in ${((Date.now() - started) / 1000).toFixed(1)} s`)
  if (result.status !== 0) process.exit(result.status ?? 1)
}

if (process.env.SKIP_LINT !== '1') run('npx', ['eslint', '.'])
if (process.env.SKIP_BUILD !== '1') run('npx', ['nuxt', 'build'])
run('npx', ['vitest', 'run', ...process.argv.slice(2)])
