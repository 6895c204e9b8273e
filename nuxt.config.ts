// Tiltwright's Nuxt configuration. Anything that would reach the internet is off:
// no telemetry, no devtools, no font downloads (Nunito ships from @fontsource).
const fakePayments = process.env.TILTWRIGHT_FAKE_PAYMENTS !== '0'
// Secure-only cookies when the app is served over HTTPS (production); plain HTTP locally.
const secureCookies = (process.env.TILTWRIGHT_PUBLIC_URL ?? '').startsWith('https://')

export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  srcDir: '.',
  serverDir: 'server',
  telemetry: false,
  devtools: { enabled: false },
  ssr: true,
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', 'nuxt-security'],
  css: ['~/assets/css/main.css'],
  tailwindcss: { viewer: false, cssPath: false },
  typescript: { strict: true },
  runtimeConfig: {
    databaseUrl: 'mysql://root@127.0.0.1:3406/tiltwright',
    smtpHost: '127.0.0.1',
    smtpPort: 1025,
    smtpUser: '',
    smtpPassword: '',
    mailFrom: 'Tiltwright <hello@tiltwright.test>',
    mailCatcherUrl: 'http://127.0.0.1:1080',
    publicUrl: 'http://localhost:3000',
    fakePayments,
    public: { fakeServices: fakePayments },
    session: { maxAge: 60 * 60 * 24 * 14 },
  },
  security: {
    headers: {
      contentSecurityPolicy: {
        'img-src': ["'self'", 'data:', 'blob:'],
        'upgrade-insecure-requests': false,
      },
      crossOriginEmbedderPolicy: false,
    },
    rateLimiter: false,
    // Same-origin proof for every state-changing request: nuxt-csurf's token, sent by
    // useApi() from the page's meta tag. The payment provider's webhook is exempt below.
    csrf: { https: secureCookies, methodsToProtect: ['POST', 'PUT', 'PATCH', 'DELETE'] },
    xssValidator: false,
    requestSizeLimiter: { maxRequestSizeInBytes: 2_000_000, maxUploadFileRequestInBytes: 12_000_000 },
  },
  // The test suite builds into folders of its own so a running dev server is not disturbed.
  buildDir: process.env.TILTWRIGHT_BUILD_DIR || '.nuxt',
  nitro: {
    output: { dir: process.env.TILTWRIGHT_OUTPUT_DIR || '.output' },
  },
})
