// @ts-check
// Lint rules that keep src/app in one Angular style (docs/conventions.md, "Angular
// style"), plus typescript-eslint's recommended set for shared/ and server/.
// `npm run lint` runs it; `npx eslint src/app` checks the app alone.
import angular from 'angular-eslint';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.angular/**', 'test-results/**', '.data/**'] },
  {
    files: ['src/**/*.ts'],
    extends: [...tseslint.configs.recommended, ...angular.configs.tsRecommended],
    processor: angular.processInlineTemplates,
    rules: {
      // One selector prefix for every component and directive.
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'rw', style: 'kebab-case' }],
      '@angular-eslint/directive-selector': ['error', { type: 'attribute', prefix: 'rw', style: 'camelCase' }],
      '@angular-eslint/pipe-prefix': 'off',
      // Zoneless app: every component re-renders from signals only.
      '@angular-eslint/prefer-on-push-component-change-detection': 'error',
      // Signal inputs/outputs/queries and inject(), never the decorator forms.
      '@angular-eslint/prefer-signals': 'error',
      '@angular-eslint/prefer-output-emitter-ref': 'error',
      '@angular-eslint/prefer-inject': 'error',
      '@angular-eslint/prefer-output-readonly': 'error',
      '@angular-eslint/use-component-view-encapsulation': 'error',
      '@angular-eslint/component-class-suffix': 'off', // pages and parts are named for what they are (SignInPage, HardpointTable)
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    // Type-aware: a `!` or `as` the compiler does not need says nothing and hides the next real one
    // (with noUncheckedIndexedAccess, a kept `!` is a claim someone checked).
    files: ['src/**/*.ts'],
    languageOptions: { parserOptions: { project: ['./tsconfig.app.json', './tsconfig.spec.json'], tsconfigRootDir: import.meta.dirname } },
    rules: { '@typescript-eslint/no-unnecessary-type-assertion': 'error' },
  },
  {
    files: ['shared/**/*.ts', 'server/**/*.ts'],
    languageOptions: { parserOptions: { project: ['./tsconfig.node.json'], tsconfigRootDir: import.meta.dirname } },
    rules: { '@typescript-eslint/no-unnecessary-type-assertion': 'error' },
  },
  {
    files: ['src/**/*.html'],
    extends: [...angular.configs.templateRecommended],
    rules: {
      // No escape hatches in templates: type the value in the component instead.
      '@angular-eslint/template/no-any': 'error',
      '@angular-eslint/template/prefer-control-flow': 'error',
      '@angular-eslint/template/prefer-self-closing-tags': 'error',
      '@angular-eslint/template/eqeqeq': ['error', { allowNullOrUndefined: true }],
    },
  },
  {
    files: ['shared/**/*.ts', 'server/**/*.ts'],
    extends: [...tseslint.configs.recommended],
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      // A service wired after a closure that reads it (server/app.ts) stays a `let`.
      'prefer-const': ['error', { ignoreReadBeforeAssign: true }],
    },
  },
);
