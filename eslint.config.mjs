// @nuxt/eslint writes the project-aware base config into .nuxt/ on `nuxt prepare`; run that first
// on a fresh clone (`npm test` does).
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt(
  { ignores: ['.output/**', '.nuxt/**', 'node_modules/**', 'test-output/**', 'drizzle/meta/**'] },
  {
    rules: {
      // Layout is not linted (stylistic: false in nuxt.config.ts); this one slipped in with vue's set.
      'vue/first-attribute-linebreak': 'off',
    },
  },
)
