import { cp } from 'node:fs/promises'
import { resolve } from 'node:path'

export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  // root-level layout on Nuxt 4 (STYLE.md): pages, components, server… live at the project root
  srcDir: '.',
  dir: { app: 'app' },
  // separate build folders let several people build one checkout at once (see DEVELOPERS.md)
  buildDir: process.env.GLOAMLINE_BUILD_DIR || '.nuxt',
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  css: [
    '@fontsource/work-sans/400.css',
    '@fontsource/work-sans/500.css',
    '@fontsource/work-sans/600.css',
    '~/assets/css/tailwind.css'
  ],
  tailwindcss: { cssPath: '~/assets/css/tailwind.css', configPath: 'tailwind.config.ts' },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Gloamline',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Crew shifts at high-latitude sites, planned around the light.' }
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }]
    }
  },
  // Security headers on every page and API reply. Nuxt's hydration payload and the theme script are
  // inline, and FullCalendar injects its own styles, so scripts and styles allow 'unsafe-inline';
  // everything else is same-origin only and nothing may frame the app.
  routeRules: {
    '/**': {
      headers: {
        'Content-Security-Policy': [
          "default-src 'self'",
          "script-src 'self' 'unsafe-inline'",
          "style-src 'self' 'unsafe-inline'",
          "img-src 'self' data: blob:",
          "font-src 'self' data:",
          "connect-src 'self'",
          "frame-src 'self' data: about:",
          "object-src 'none'",
          "base-uri 'self'",
          "form-action 'self'",
          "frame-ancestors 'none'"
        ].join('; '),
        'X-Content-Type-Options': 'nosniff',
        'X-Frame-Options': 'DENY',
        'Referrer-Policy': 'same-origin',
        'Permissions-Policy': 'camera=(), microphone=(), geolocation=(self)'
      }
    }
  },
  runtimeConfig: {
    databasePath: process.env.DATABASE_PATH || '.data/gloamline.sqlite',
    migrationsDir: process.env.MIGRATIONS_DIR || '',
    smtpUrl: '',
    forecastBaseUrl: '',
    publicBaseUrl: '',
    session: { maxAge: 60 * 60 * 24 * 14 }
  },
  nitro: {
    output: { dir: process.env.GLOAMLINE_OUTPUT_DIR || '.output' },
    experimental: { tasks: true },
    hooks: {
      // migrations are not part of the build output: copy them next to the built server
      compiled: async (nitro) => {
        await cp(resolve(nitro.options.rootDir, 'drizzle'), resolve(nitro.options.output.serverDir, 'drizzle'), { recursive: true })
      }
    }
  },
  typescript: { strict: true }
})
