// The linter decides layout (`npm run lint`; `npm run lint:fix` rewrites what it can).
// The base is @nuxt/eslint's generated config (its recommended rules and the stylistic
// rules set in nuxt.config.ts); what follows is Tiltwright's own choices.
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt(
  {
    ignores: ['data/**', 'tests/.artifacts/**', '.output*/**', '.nuxt*/**', 'drizzle/**'],
  },
  {
    rules: {
      // A diff must read side by side: no line longer than this, comments and strings included.
      '@stylistic/max-len': [
        'error',
        {
          code: 100,
          tabWidth: 2,
          ignoreUrls: false,
          ignoreStrings: false,
          ignoreTemplateLiterals: false,
          ignoreComments: false,
          ignoreRegExpLiterals: false,
        },
      ],
    },
  },
  {
    // The payment fake's objects and the tests' JSON replies are loosely shaped JSON by design.
    files: ['server/fake-payments/**', 'tests/**'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
)
