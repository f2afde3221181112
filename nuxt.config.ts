import { cp } from 'node:fs/promises'
import { resolve } from 'node:path'

export default defineNuxtConfig({
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', '@nuxt/eslint', '@vite-pwa/nuxt'],
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Gloamline',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Crew shifts at high-latitude sites, planned around the light.' }
      ],
      link: [
        { rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' },
        { rel: 'manifest', href: '/manifest.webmanifest' },
        { rel: 'apple-touch-icon', href: '/icon-192.png' }
      ]
    }
  },
  css: [
    '@fontsource/work-sans/400.css',
    '@fontsource/work-sans/500.css',
    '@fontsource/work-sans/600.css',
    '~/assets/css/tailwind.css'
  ],
  // Only what Nuxt modules read: nuxt-auth-utils takes the session settings (its password from
  // NUXT_SESSION_PASSWORD at run time). The app's own settings are read from the environment at run
  // time, once, by server/utils/config.ts.
  runtimeConfig: {
    session: { maxAge: 60 * 60 * 24 * 14 }
  },
  dir: { app: 'app' },
  // root-level layout on Nuxt 4 (docs/code.md): pages, components, server… live at the project root
  srcDir: '.',
  // separate build folders let several people build one checkout at once (see DEVELOPERS.md)
  buildDir: process.env.GLOAMLINE_BUILD_DIR || '.nuxt',
  // Security headers on every page and API reply. Nuxt's hydration payload and the theme script are
  // inline, and FullCalendar injects its own styles, so scripts and styles allow 'unsafe-inline';
  // everything else is same-origin only and nothing may frame the app.
  routeRules: {
    '/**': {
      headers: {
        'Content-Security-Policy': [
          'default-src \'self\'',
          'script-src \'self\' \'unsafe-inline\'',
          'style-src \'self\' \'unsafe-inline\'',
          'img-src \'self\' data: blob:',
          'font-src \'self\' data:',
          'connect-src \'self\'',
          'frame-src \'self\' data: about:',
          'object-src \'none\'',
          'base-uri \'self\'',
          'form-action \'self\'',
          'frame-ancestors \'none\''
        ].join('; '),
        'X-Content-Type-Options': 'nosniff',
        'X-Frame-Options': 'DENY',
        'Referrer-Policy': 'same-origin',
        'Permissions-Policy': 'camera=(), microphone=(), geolocation=(self)'
      }
    }
  },
  compatibilityDate: '2026-11-01',
  nitro: {
    output: { dir: process.env.GLOAMLINE_OUTPUT_DIR || '.output' },
    experimental: { tasks: true },
    // services (database reads and writes) are auto-imported like utils; core and adapters are imported explicitly
    imports: { dirs: ['server/services'] },
    hooks: {
      // migrations are not part of the build output: copy them next to the built server
      compiled: async (nitro) => {
        await cp(resolve(nitro.options.rootDir, 'drizzle'), resolve(nitro.options.output.serverDir, 'drizzle'), { recursive: true })
      }
    }
  },
  typescript: { strict: true },
  telemetry: false,
  // @nuxt/eslint with its stylistic rules: single quotes, no semicolons, two-space indent, 1tbs
  eslint: { config: { stylistic: { quotes: 'single', semi: false, indent: 2, commaDangle: 'never', braceStyle: '1tbs' } } },
  // Installable and usable with no connection (the crew's phone in a hut where the link is down).
  // The service worker keeps the built app (scripts, styles, fonts, icons) and nothing else on its
  // own: API replies always go to the network. A page is served from the cache only when the network
  // fails, and only the crew home that the page itself stored for the signed-in crew member
  // (composables/useOwnCopy.ts), which signing out deletes.
  pwa: {
    registerType: 'autoUpdate',
    outDir: resolve(process.env.GLOAMLINE_OUTPUT_DIR || '.output', 'public'),
    manifest: {
      name: 'Gloamline',
      short_name: 'Gloamline',
      description: 'Crew shifts at high-latitude sites, planned around the light.',
      lang: 'en',
      start_url: '/',
      scope: '/',
      display: 'standalone',
      theme_color: '#16213a',
      background_color: '#0f1526',
      icons: [
        { src: '/icon-192.png', sizes: '192x192', type: 'image/png' },
        { src: '/icon-512.png', sizes: '512x512', type: 'image/png' },
        { src: '/icon-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' }
      ]
    },
    workbox: {
      navigateFallback: null,
      globPatterns: ['**/*.{js,css,woff2,png,svg}'],
      cleanupOutdatedCaches: true,
      runtimeCaching: [{
        urlPattern: ({ request }) => request.mode === 'navigate',
        handler: 'NetworkOnly',
        options: {
          plugins: [{
            // no connection: the crew home the page stored for its own person, if there is one
            handlerDidError: async () => (await caches.open('gloamline-own-pages')).match('/')
          }]
        }
      }]
    },
    client: { installPrompt: false },
    devOptions: { enabled: false }
  },
  tailwindcss: { cssPath: '~/assets/css/tailwind.css', configPath: 'tailwind.config.ts' }
})
