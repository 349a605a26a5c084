// ESLint flat config: Expo's own config for this SDK (`npx expo lint` conventions), typescript-eslint's recommended
// rules, the React hooks rules, and eslint-config-prettier last so formatting is left to Prettier.
import { defineConfig } from 'eslint/config';
import expoConfig from 'eslint-config-expo/flat.js';
import prettier from 'eslint-config-prettier';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { configs as typescriptEslint } from 'typescript-eslint';

export default defineConfig([
  { ignores: ['dist/**', 'data/**', '.expo/**', 'node_modules/**', 'tests/screenshots/**', 'coverage/**'] },
  expoConfig,
  ...typescriptEslint.recommended,
  reactHooks.configs.flat.recommended,
  {
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' },
      ],
    },
  },
  {
    // The server, its scripts and the tests run on Node.
    files: ['server/**', 'tests/**', 'scripts/**', '*.config.js', '*.config.mjs'],
    languageOptions: { globals: { ...globals.node, ...globals.jest } },
  },
  {
    // Tool configuration files that their tools load as CommonJS (Metro, Babel, Jest): `require` is how they import.
    files: ['metro.config.js', 'babel.config.js', 'jest.config.js'],
    languageOptions: { sourceType: 'commonjs', globals: globals.node },
    rules: { '@typescript-eslint/no-require-imports': 'off' },
  },
  prettier,
]);
