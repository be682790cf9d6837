import { cp } from 'node:fs/promises'
import { createRequire } from 'node:module'
import { resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { API_CSP, BASE_SECURITY_HEADERS } from './server/utils/security-headers'

// The dev mailbox (fake SMTP inbox pages) is compiled in only when the local scripts ask
// for it, so a production build has no such routes at all.
const localMail = process.env.BARSMITH_LOCAL_MAIL === '1'

export default defineNuxtConfig({
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', '@nuxt/eslint'],
  ssr: true,

  imports: {
    dirs: ['stores'],
  },
  devtools: { enabled: false },

  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Barsmith',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Write songs against the beat, bar by bar, with your crew.' },
        { name: 'theme-color', content: '#f4ecdc' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },

  css: [
    '@fontsource/literata/latin-400.css',
    '@fontsource/literata/latin-400-italic.css',
    '@fontsource/literata/latin-600.css',
    '@fontsource/public-sans/latin-400.css',
    '@fontsource/public-sans/latin-500.css',
    '@fontsource/public-sans/latin-600.css',
    '~/assets/css/main.css',
  ],

  runtimeConfig: {
    session: {
      name: 'barsmith-session',
      maxAge: 60 * 60 * 24 * 14,
      cookie: { sameSite: 'lax' },
    },
    public: {
      localMail,
    },
  },

  // Security headers on every response, static files included. Rendered pages replace the
  // locked-down policy with the page policy and its nonce (server/plugins/05.csp.ts).
  routeRules: {
    '/**': { headers: { ...BASE_SECURITY_HEADERS, 'Content-Security-Policy': API_CSP } },
  },
  compatibilityDate: '2026-06-01',

  nitro: {
    experimental: { tasks: false },
    // Literata as shipped by @fontsource, embedded in the sheet PDFs (useStorage('assets:fonts')).
    serverAssets: [{
      baseName: 'fonts',
      dir: fileURLToPath(new URL('./node_modules/@fontsource/literata/files', import.meta.url)),
      pattern: 'literata-latin-{400,600}-{normal,italic}.woff',
    }],
    // The prosody engine reads the dictionary's data file at run time (server/utils/prosody/dictionary.ts).
    externals: { traceInclude: [createRequire(import.meta.url).resolve('cmu-pronouncing-dictionary')] },
    handlers: localMail
      ? [
          { route: '/api/dev/mail', method: 'get', handler: '~~/server/dev/mail.get.ts' },
          { route: '/api/dev/mail/:id', method: 'get', handler: '~~/server/dev/mail-id.get.ts' },
        ]
      : [],
    hooks: {
      // Drizzle's migrator reads the SQL files at run time; ship them beside the server bundle.
      async compiled(nitro) {
        await cp(resolve(nitro.options.rootDir, 'drizzle'), resolve(nitro.options.output.serverDir, 'drizzle'), { recursive: true })
      },
    },
  },

  typescript: {
    strict: true,
  },
  telemetry: false,

  hooks: {
    // Barsmith's JSON error handler runs first for API routes; Nuxt's (error pages) after it.
    'nitro:config'(config) {
      const own = fileURLToPath(new URL('./server/error-handler.ts', import.meta.url))
      config.errorHandler = [own, ...[config.errorHandler ?? []].flat()]
    },
    'pages:extend'(pages) {
      if (localMail) return
      for (let i = pages.length - 1; i >= 0; i--) {
        if (pages[i]!.path.startsWith('/dev')) pages.splice(i, 1)
      }
    },
    // Vite's SSR dev server would otherwise open a websocket on every interface.
    'vite:extendConfig'(config, { isServer }) {
      if (isServer && config.server) config.server.ws = false
    },
  },

  eslint: {
    config: { stylistic: true },
  },
})
