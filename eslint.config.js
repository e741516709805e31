// ESLint flat config: JavaScript's and typescript-eslint's recommended rules, Vue's recommended
// rules for single-file components, and eslint-config-prettier last so nothing here argues with
// Prettier about layout. `npm run lint` fails on any warning.
import js from '@eslint/js';
import prettier from 'eslint-config-prettier';
import { defineConfig } from 'eslint/config';
import vue from 'eslint-plugin-vue';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default defineConfig(
  {
    ignores: ['dist/**', 'dist-server/**', 'var/**', 'uploads/**', 'public/**', 'test-results/**', 'coverage/**'],
  },
  js.configs.recommended,
  // Rules without type information: type-aware linting would build the whole TypeScript program
  // again on every run; `npm run typecheck` already does that.
  tseslint.configs.recommended,
  vue.configs['flat/recommended'],
  {
    files: ['**/*.vue'],
    languageOptions: { parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.vue'] } },
  },
  {
    files: ['server/**', 'shared/**', 'tests/**', '*.config.{js,ts}'],
    languageOptions: { globals: globals.node },
  },
  {
    files: ['src/**'],
    languageOptions: { globals: globals.browser },
  },
  {
    files: ['src/sw.ts'],
    languageOptions: { globals: globals.serviceworker },
  },
  {
    files: ['src/workers/**'],
    languageOptions: { globals: globals.worker },
  },
  {
    rules: {
      // an unused argument or binding is spelled with a leading underscore on purpose (Express's
      // (err, req, res, next), callbacks that ignore their first argument)
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
      // off: every control-character class here is deliberate (file names, mail headers and search
      // text are cleaned of control characters), which is the only thing this rule finds
      'no-control-regex': 'off',
    },
  },
  {
    files: ['**/*.vue'],
    rules: {
      // the submit form's step components edit the draft store's reactive objects handed to them as
      // props (recipe.material = …); replacing a prop itself is still an error
      'vue/no-mutating-props': ['error', { shallowOnly: true }],
    },
  },
  {
    files: ['tests/**/*.test.ts'],
    rules: {
      // test names read "unit · scenario · expectation" (titles written as plain strings; template
      // titles of it.each tables are left to review)
      'no-restricted-syntax': [
        'error',
        {
          selector: 'CallExpression[callee.name=/^(it|test)$/] > Literal.arguments:first-child:not([value=/^(?:(?! · ).)+ · (?:(?! · ).)+ · (?:(?! · ).)+$/])',
          message: 'Name the test "unit · scenario · expectation".',
        },
      ],
    },
  },
  prettier,
);
