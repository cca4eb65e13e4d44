// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt({
  rules: {
    // Long attribute lists read better on one line in small templates.
    'vue/max-attributes-per-line': 'off',
    'vue/singleline-html-element-content-newline': 'off',
    'vue/multiline-html-element-content-newline': 'off',
  },
}, {
  // Test clients read replies of many shapes; typing each one adds nothing to what the assertions check.
  files: ['tests/**'],
  rules: { '@typescript-eslint/no-explicit-any': 'off' },
}, {
  ignores: ['.data/**', 'tests/.artifacts/**', 'bench/.out/**'],
})
