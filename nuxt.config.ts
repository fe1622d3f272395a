import { cp } from 'node:fs/promises'
import { resolve } from 'node:path'
import { fileURLToPath } from 'node:url'

const projectRoot = fileURLToPath(new URL('.', import.meta.url))

// https://nuxt.com/docs/api/nuxt-config
export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  devtools: { enabled: false },
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  css: [
    // Noto Sans ships with the app (latin subset only): no external font URL anywhere.
    '@fontsource/noto-sans/latin-400.css',
    '@fontsource/noto-sans/latin-600.css',
    '@fontsource/noto-sans/latin-700.css',
    '~/assets/css/main.css',
  ],
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Tightwell',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Tightwell — air-leakage test results checked against the limit in force.' },
        { name: 'theme-color', content: '#245e5b' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    // Overridden by environment variables (see README "Configuration").
    databaseUrl: '', // NUXT_DATABASE_URL; empty → file under .data/
    demo: '', // NUXT_DEMO; empty → decided from TIGHTWELL_DEMO / NODE_ENV at start
    session: {
      name: 'tightwell-session',
      maxAge: 60 * 60 * 12,
      password: '',
    },
  },
  typescript: { strict: true },
  nitro: {
    // The model limit tables in rules/ ship inside the server build (read by the demo seed and
    // the "start from a model table" action): useStorage('assets:rules').
    serverAssets: [{ baseName: 'rules', dir: resolve(projectRoot, 'rules') }],
  },
  tailwindcss: { configPath: 'tailwind.config.ts', cssPath: false },
  hooks: {
    // The built server applies migrations at start, so it needs drizzle/ beside it.
    'nitro:init'(nitro) {
      if (nitro.options.dev) return
      nitro.hooks.hook('compiled', async () => {
        await cp(resolve(projectRoot, 'drizzle'), resolve(nitro.options.output.serverDir, 'drizzle'), { recursive: true })
      })
    },
  },
})
