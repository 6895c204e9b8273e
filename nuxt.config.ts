import { resolve } from 'node:path'
import { CARD_HOLD_HOURS } from './shared/utils/lifetimes'

// Tiltwright's Nuxt configuration. Anything that would reach the internet is off:
// no telemetry, no devtools, no font downloads (Nunito ships from @fontsource).
const fakePayments = process.env.TILTWRIGHT_FAKE_PAYMENTS !== '0'
// The local fake of the payment provider (server/fake-payments/) exists only in fake mode:
// its API under /v1/** (where the SDK calls) and its hosted payment pages under /fake-pay/**.
const fakePaymentHandlers = fakePayments
  ? [
      { route: '/v1/**', handler: '~~/server/fake-payments/api.ts' },
      { route: '/fake-pay/**', handler: '~~/server/fake-payments/pages.ts' },
    ]
  : []
// Secure-only cookies when the app is served over HTTPS (production); plain HTTP locally.
const secureCookies = (process.env.TILTWRIGHT_PUBLIC_URL ?? '').startsWith('https://')

export default defineNuxtConfig({
  modules: [
    '@nuxt/eslint',
    '@nuxtjs/tailwindcss',
    '@pinia/nuxt',
    'nuxt-auth-utils',
    'nuxt-security',
  ],
  ssr: true,
  // components/tickets/Ticket*.vue keep their own names (TicketThread, not TicketsTicketThread).
  components: [{ path: '~/components/tickets', pathPrefix: false }, '~/components'],
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  css: ['~/assets/css/main.css'],
  runtimeConfig: {
    databaseUrl: 'mysql://root@127.0.0.1:3406/tiltwright',
    smtpHost: '127.0.0.1',
    smtpPort: 1025,
    smtpUser: '',
    smtpPassword: '',
    mailFrom: 'Tiltwright <hello@tiltwright.test>',
    /** Where new tickets and customers' messages on unassigned tickets are mailed. */
    supportEmail: 'support@tiltwright.test',
    mailCatcherUrl: 'http://127.0.0.1:1080',
    /** First retry delay of a failed job (mail, provider call, webhook delivery); doubles after. */
    outboxRetryBaseMs: 15_000,
    // How long a job runner's claim holds a job (renewed while it runs); a runner that dies
    // frees its job after at most this long (server/utils/jobs.ts).
    jobLeaseMs: 30_000,
    cardHoldHours: CARD_HOLD_HOURS,
    cardHoldSweepMs: 600_000,
    publicUrl: 'http://localhost:3000',
    // Comma-separated addresses of reverse proxies whose X-Forwarded-For is believed
    // (NUXT_TRUSTED_PROXIES); empty: the direct peer is the client.
    trustedProxies: '',
    fakePayments,
    // The payment SDK: key, API address (empty = the provider's own; in fake mode the app
    // itself at publicUrl) and the webhook signing secret. No secret lives here: they come from
    // the environment (NUXT_PAYMENTS_SECRET_KEY, NUXT_PAYMENTS_WEBHOOK_SECRET), which
    // `npm start` fills from data/secrets.json in fake mode; server/plugins/0.secrets.ts
    // refuses to start without them.
    paymentsSecretKey: '',
    paymentsApiUrl: '',
    paymentsWebhookSecret: '',
    /** Unpaid card orders a school may hold at once (each holds stock). */
    maxUnpaidCardOrders: 3,
    // pdfkit embeds Nunito from here (the @fontsource files the pages use too).
    fontDir: resolve('node_modules/@fontsource/nunito/files'),
    public: { fakeServices: fakePayments },
    // The session cookie is Secure exactly when the app is served over HTTPS (browsers drop a
    // Secure cookie over plain HTTP); NUXT_SESSION_COOKIE_SECURE overrides it at run time.
    session: { maxAge: 60 * 60 * 24 * 14, cookie: { secure: secureCookies } },
  },
  srcDir: '.',
  serverDir: 'server',
  // The test suite builds into folders of its own so a running dev server is not disturbed.
  buildDir: process.env.TILTWRIGHT_BUILD_DIR || '.nuxt',
  routeRules: {
    // The planner's computation is open to anyone and changes nothing: no CSRF token needed,
    // but a per-address rate limit keeps it from being used as a free CPU. The limit is counted
    // in the database (server/middleware/rate-limits.ts), not in nuxt-security's in-memory
    // limiter, so that every instance behind a load balancer shares one count.
    '/api/planner/**': { csurf: false },
    // Callers that cannot carry a page's CSRF token: the payment provider's webhook, and the
    // fake's API and hosted pages (the fake is not served at all outside fake mode).
    '/api/webhooks/**': { csurf: false },
    '/v1/**': { csurf: false },
    '/fake-pay/**': { csurf: false },
  },
  compatibilityDate: '2026-11-01',
  nitro: {
    // Durable jobs (server/utils/jobs.ts) are run by a scheduled task every five seconds, and
    // nudged right after the transaction that queues them.
    experimental: { tasks: true },
    scheduledTasks: { '*/5 * * * * *': ['jobs:run'] },
    // Uploaded purchase orders and tax certificates: local disk outside anything served.
    storage: {
      uploads: { driver: 'fs', base: process.env.TILTWRIGHT_UPLOAD_DIR || resolve('data/uploads') },
    },
    output: { dir: process.env.TILTWRIGHT_OUTPUT_DIR || '.output' },
  },
  serverHandlers: fakePaymentHandlers,
  // The planner's worker (workers/planner.worker.ts) imports the model: module workers, so the
  // build can split it into chunks like the page.
  vite: { worker: { format: 'es' } },
  typescript: {
    strict: true,
    // odex (a test-only ODE solver) ships TypeScript sources that fail strict checks.
    tsConfig: { compilerOptions: { paths: { odex: ['../tests/types/odex.d.ts'] } } },
  },
  telemetry: false,
  // `npm run lint`: @nuxt/eslint's rules plus its stylistic ones (layout, quotes, Vue attributes);
  // the project's own choices are in eslint.config.mjs.
  eslint: {
    config: {
      stylistic: {
        indent: 2,
        quotes: 'single',
        semi: false,
        commaDangle: 'always-multiline',
        braceStyle: '1tbs',
      },
    },
  },
  security: {
    headers: {
      contentSecurityPolicy: {
        'default-src': ['\'self\''],
        'img-src': ['\'self\'', 'data:', 'blob:'],
        'upgrade-insecure-requests': false,
      },
      crossOriginEmbedderPolicy: false,
    },
    rateLimiter: false,
    // Same-origin proof for every state-changing request: nuxt-csurf's token, sent by
    // useApi() from the page's meta tag. The payment provider's webhook is exempt below.
    csrf: { https: secureCookies, methodsToProtect: ['POST', 'PUT', 'PATCH', 'DELETE'] },
    xssValidator: false,
    // Body sizes are limited while the body streams in (server/utils/body-limits.ts); the module's
    // limiter only reads Content-Length, which a chunked request does not send.
    requestSizeLimiter: false,
  },
  tailwindcss: { viewer: false, cssPath: false },
})
