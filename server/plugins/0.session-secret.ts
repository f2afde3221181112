// Without a session password every session call fails with a 500: refuse to start instead.
export default defineNitroPlugin(() => {
  const password = useRuntimeConfig().session?.password
  if (typeof password !== 'string' || password.length < 32) {
    console.error('[gloamline] NUXT_SESSION_PASSWORD is missing or shorter than 32 characters. Set it, or start with `npm start`, which generates one under .data/.')
    process.exit(1)
  }
})
