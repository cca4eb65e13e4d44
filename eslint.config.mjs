// @ts-check
import withNuxt from './.nuxt/eslint.config.mjs'

const ENGINE_THROUGH_INDEX = { regex: '(^|/)digits/', message: 'Import the digit engine from \'#shared/digits\' (its index).' }
const DATA_CALLS = ['$fetch', 'useFetch', 'useLazyFetch', 'useAsyncData', 'useLazyAsyncData', 'useRequestFetch']
const DATA_HOME = 'Load and change data through the resource\'s composable (app/composables) or the document store, never from a component or page.'

export default withNuxt({
  rules: {
    // Long attribute lists read better on one line in small templates.
    'vue/max-attributes-per-line': 'off',
    'vue/singleline-html-element-content-newline': 'off',
    'vue/multiline-html-element-content-newline': 'off',
  },
}, {
  // The engine is plain TypeScript: its modules import one another and two pure maths packages
  // (jstat; stdlib's regularized incomplete beta, for tails jstat cannot give), nothing else
  // (no Vue, Nitro, database or Node built-ins), so that it runs the same in the page, the server and a thread.
  files: ['shared/digits/**'],
  rules: {
    'no-restricted-imports': ['error', { patterns: [{ regex: '^(?!\\./|jstat$|@stdlib/math-base-special-betainc$)', message: 'The digit engine imports only its own modules (./…), jstat and @stdlib/math-base-special-betainc.' }] }],
  },
}, {
  // Everything else reaches the engine through its index, which is its one public surface.
  ignores: ['shared/digits/**'],
  rules: {
    'no-restricted-imports': ['error', { patterns: [ENGINE_THROUGH_INDEX] }],
  },
}, {
  // The client's data has one home per resource: a composable in app/composables, or the document
  // store for the open investigation. Components, pages and layouts show it and call their actions.
  files: ['app/components/**', 'app/pages/**', 'app/layouts/**', 'app/app.vue', 'app/error.vue'],
  rules: {
    'no-restricted-globals': ['error', ...DATA_CALLS.map(name => ({ name, message: DATA_HOME }))],
    'no-restricted-syntax': ['error', { selector: 'MemberExpression[property.name="$fetch"]', message: DATA_HOME }],
    'no-restricted-imports': ['error', {
      paths: [...['#imports', '#app', 'nuxt/app'].map(name => ({ name, importNames: DATA_CALLS, message: DATA_HOME })), { name: 'ofetch', message: DATA_HOME }],
      patterns: [ENGINE_THROUGH_INDEX],
    }],
  },
}, {
  // Test clients read replies of many shapes; typing each one adds nothing to what the assertions check.
  files: ['tests/**'],
  rules: { '@typescript-eslint/no-explicit-any': 'off' },
}, {
  ignores: ['.data/**', 'tests/.artifacts/**', 'bench/.out/**'],
})
