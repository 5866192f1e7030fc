// One lint configuration for the whole repository: typescript-eslint's recommended rules everywhere,
// and the Office platform's add-in rules (load before read, sync before read, no sync in a loop) on src/excel.
import tseslint from 'typescript-eslint';
import officeAddins from 'eslint-plugin-office-addins';

export default tseslint.config(
  { ignores: ['node_modules/**', 'dist/**', 'build/**', 'out/**', 'coverage/**', 'test-artifacts/**'] },
  ...tseslint.configs.recommended,
  {
    files: ['src/**/*.{ts,tsx}'],
    rules: {
      'no-console': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/cli/**/*.ts'],
    rules: { 'no-console': 'off' },
  },
  {
    files: ['src/excel/**/*.ts'],
    plugins: { 'office-addins': officeAddins },
    rules: {
      'office-addins/call-sync-after-load': 'error',
      'office-addins/call-sync-before-read': 'error',
      'office-addins/load-object-before-read': 'error',
      'office-addins/no-context-sync-in-loop': 'error',
      'office-addins/no-empty-load': 'error',
      'office-addins/no-navigational-load': 'error',
      'office-addins/test-for-null-using-isNullObject': 'error',
    },
  },
);
