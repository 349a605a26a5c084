/**
 * Jest projects (all node + ts-jest with the server tsconfig):
 * - `engine`: the pure computation checked against published sources (tests/engine);
 * - `api`: the HTTP API and the server services (tests/api, tests/server);
 * - `slow`: suites that take more than about 20 s on a 2-core machine (fuzzing, crash-and-restart, scaling), and any
 *   file named `*.slow.test.ts`.
 * `npm test` runs all three, then the browser tests.
 */
const SLOW = ['tests/api/fuzz.test.ts', 'tests/api/crash.test.ts'];

const base = {
  testEnvironment: 'node',
  roots: ['<rootDir>/tests'],
  transform: {
    '^.+\\.ts$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }],
  },
  moduleFileExtensions: ['ts', 'js', 'json'],
};
const slowPaths = SLOW.map((p) => `<rootDir>/${p}`);
const escape = (p) => p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

module.exports = {
  testTimeout: 30000,
  projects: [
    { ...base, displayName: 'engine', testMatch: ['<rootDir>/tests/engine/**/*.test.ts'] },
    {
      ...base,
      displayName: 'api',
      testMatch: ['<rootDir>/tests/{api,server}/**/*.test.ts'],
      testPathIgnorePatterns: ['/node_modules/', '\\.slow\\.test\\.ts$', ...SLOW.map(escape)],
    },
    { ...base, displayName: 'slow', testMatch: [...slowPaths, '<rootDir>/tests/**/*.slow.test.ts'] },
  ],
};
