// Run-time values come from NUXT_* variables set by scripts/start.sh and the tests. The only
// build-time variables are the output and build folders, so the tests build beside a running npm start
// and beside their own type check (which reads .nuxt/).
export default defineNuxtConfig({
  ...(process.env.TRAPLINE_BUILD_DIR ? { buildDir: process.env.TRAPLINE_BUILD_DIR } : {}),
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', '@nuxt/eslint'],
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Trapline',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Timing, inspection and sealed evidence for speed-record attempts' },
        { name: 'theme-color', content: '#0b1d2a' },
      ],
      link: [
        { rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' },
        // Installable: the web app manifest (its service worker comes from modules/service-worker.ts).
        { rel: 'manifest', href: '/manifest.webmanifest' },
      ],
    },
  },
  // The fonts' faces come from modules/font-subsets.ts (Inter and Merriweather, 400 and 700, Latin; semibold
  // text takes the bold face).
  css: [
    '~/assets/css/main.css',
  ],
  runtimeConfig: {
    databaseUrl: '',
    siteUrl: 'http://localhost:3000',
    public: { inboxUrl: '' },
    seedDemo: false,
    /** The demo's seeding day (YYYY-MM-DD); empty is today. Tests set it to check the demo on other days. */
    demoToday: '',
    /** Folder of evidence files and upload staging (local driver). */
    dataDir: '.data',
    /** This app server's name among several sharing a data folder: its upload staging is its own. */
    serverId: 'main',
    /** "json": one JSON line per request on standard output (production); empty: none. */
    requestLog: '',
    /**
     * The seal's key set: a folder (a mounted secret works) with seal-ed25519.pem, seal-certificate.pem and
     * seal-certificate-key.pem, or the three PEM texts themselves. Unset: `<dataDir>/seal`, made on a first
     * start only. Several app servers share one by pointing at the same.
     */
    sealDir: '',
    sealEd25519Pem: '',
    sealCertificatePem: '',
    sealCertificateKeyPem: '',
    storage: {
      driver: 'local',
      s3: { endpoint: '', region: 'us-east-1', bucket: 'trapline-evidence', accessKeyId: '', secretAccessKey: '' },
    },
    /** Size limits per evidence kind in bytes; 0 keeps the default of shared/evidence/kinds.ts. */
    /** Bytes of evidence a team may store at one event (its entries, attempts, runs, inspections). */
    teamQuotaBytes: 20 * 1024 ** 3,
    /** Behind a proxy the operator runs: take the client's address from X-Forwarded-For. */
    trustProxy: false,
    evidenceLimits: { survey: 0, calibration: 0, scale: 0, licence: 0, photo: 0, video: 0, dataLog: 0, other: 0 },
    // tls: 'none' (the local catcher), 'starttls' (upgrade, required) or 'implicit' (port 465); user and
    // password when the server asks for them.
    mail: { host: '127.0.0.1', port: 1025, from: 'Trapline <no-reply@trapline.invalid>', tls: 'none', user: '', password: '' },
    mailRetrySeconds: 30,
    /**
     * The payment provider, through its official SDK: a secret key and the webhook's signing secret. host,
     * port and protocol point the SDK at a local fake (scripts/payments-fake.mjs) for the demo and the tests.
     */
    payments: { secretKey: 'sk_test_trapline', webhookSecret: 'whsec_trapline_demo', host: '', port: 0, protocol: 'https' },
    /** Evidence files up to this total are attached inside a dossier PDF; larger ones are referenced by hash. */
    dossierAttachBytes: 20 * 1024 * 1024,
    /**
     * Password hashing (scrypt, RFC 7914): the work factor N of new hashes. 2^14 in every build; only the
     * test server lowers it (NUXT_HASH_SCRYPT_COST with NUXT_TEST_SERVER), and a server that is not the test
     * server refuses to start with less (server/plugins/hash-cost.ts). A hash keeps its own N for checking.
     */
    hash: { scrypt: { cost: 16384 } },
    testServer: false,
    session: {
      maxAge: 60 * 60 * 12,
      cookie: { sameSite: 'lax', httpOnly: true },
    },
  },
  // Links load the next page's code when a person points at them, not every visible link's at once.
  experimental: { defaults: { nuxtLink: { prefetchOn: { visibility: false, interaction: true } } } },
  compatibilityDate: '2026-06-01',
  nitro: {
    // server/utils/ is grouped in folders by subject (auth, database, event-day, dossier…); all are auto-imported.
    imports: { dirs: ['./server/utils/**'] },
    // Built assets are written beside themselves as .br and .gz, and served so to browsers that take them.
    compressPublicAssets: { gzip: true, brotli: true },
    ...(process.env.TRAPLINE_OUTPUT_DIR ? { output: { dir: process.env.TRAPLINE_OUTPUT_DIR } } : {}),
    // Built on Node 20, the tracer leaves out the files these packages name under "module-sync" (a
    // known gap of @vercel/nft), which Node 20 then asks for (exceljs reaches them through get-intrinsic).
    externals: {
      traceInclude: ['async-function', 'async-generator-function', 'generator-function']
        .map(p => `node_modules/${p}/require.mjs`),
    },
    // The dossier's fonts, read at run time: shipped inside the build, not looked up in node_modules.
    serverAssets: [
      { baseName: 'fonts-inter', dir: '../node_modules/@fontsource/inter/files', pattern: 'inter-latin-{400,700}-normal.woff' },
      { baseName: 'fonts-merriweather', dir: '../node_modules/@fontsource/merriweather/files', pattern: 'merriweather-latin-{400,700}-normal.woff' },
    ],
  },
  // Fewer, larger chunks: each response costs its headers and a round trip on a weak link.
  vite: { build: { rollupOptions: { output: { experimentalMinChunkSize: 20_000 } } } },
  typescript: { strict: true },
  telemetry: false,
  hooks: {
    // Nor does a page hint the browser to fetch every chunk it might import later (Dexie, say, which only a
    // device that lost its link needs): on a weak link, bytes go to what the page shows.
    'build:manifest': (manifest) => {
      for (const chunk of Object.values(manifest)) chunk.prefetch = false
    },
  },
  // The linter's shared settings; project rules are in eslint.config.mjs.
  eslint: { config: { stylistic: true } },
})
