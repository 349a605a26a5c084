/**
 * Jest projects (all node + ts-jest with the server tsconfig):
 * - `engine`: the pure computation checked against published sources (tests/engine);
 * - `api`: the HTTP API and the server services (tests/api, tests/server);
 * - `slow`: suites that take more than about 20 s on a 2-core machine (fuzzing, crash-and-restart, scaling), and any
 *   file named `*.slow.test.ts`.
 * - `web`: app components rendered to HTML (babel, react-native-web, react-dom/server) to check what screens say.
 * `npm test` runs all four, then the browser tests.
 */
const os = require('node:os');

const SLOW = ['tests/api/fuzz.test.ts', 'tests/api/crash.test.ts'];

/**
 * API suites about CPU and memory limits rather than storage (a label batch's event-loop share, workbook zip bombs,
 * the study worker thread): on PostgreSQL (TEST_DATABASE_URL=postgres://…, the CI's second pass) they would only
 * repeat the SQLite pass, so that pass leaves them out. Label batches, imports and runs stay covered there by
 * labelPdf, studyImport and studies.
 */
const DB_AGNOSTIC = [
  'tests/api/labelBatchLimits.test.ts',
  'tests/api/workbookBomb.test.ts',
  'tests/api/studyWorker.test.ts',
];
const onPostgres = /^postgres(ql)?:\/\//.test(process.env.TEST_DATABASE_URL ?? '');

const base = {
  testEnvironment: 'node',
  roots: ['<rootDir>/tests'],
  transform: {
    '^.+\\.ts$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }],
  },
  moduleFileExtensions: ['ts', 'js', 'json'],
};
const slowPaths = SLOW.map((p) => `<rootDir>/${p}`);
const escapeRegExp = (p) => p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

module.exports = {
  testTimeout: 30000,
  // Jest's own default is one worker fewer than the cores: a single worker on a 2-core CI machine. Two workers there
  // (the suites wait on SQLite, the mail sink and child servers part of the time) nearly halve the run.
  maxWorkers: Math.max(2, (os.availableParallelism?.() ?? os.cpus().length) - 1),
  projects: [
    {
      ...base,
      displayName: 'engine',
      testMatch: ['<rootDir>/tests/engine/**/*.test.ts'],
      testPathIgnorePatterns: ['/node_modules/', '\\.slow\\.test\\.ts$'],
    },
    {
      ...base,
      displayName: 'api',
      testMatch: ['<rootDir>/tests/{api,server}/**/*.test.ts'],
      testPathIgnorePatterns: [
        '/node_modules/',
        '\\.slow\\.test\\.ts$',
        ...SLOW.map(escapeRegExp),
        ...(onPostgres ? DB_AGNOSTIC.map(escapeRegExp) : []),
      ],
    },
    { ...base, displayName: 'slow', testMatch: [...slowPaths, '<rootDir>/tests/**/*.slow.test.ts'] },
    {
      displayName: 'web',
      testEnvironment: 'node',
      roots: ['<rootDir>/tests'],
      testMatch: ['<rootDir>/tests/web/**/*.test.tsx'],
      transform: { '^.+\\.[jt]sx?$': 'babel-jest' },
      moduleNameMapper: {
        '^react-native$': 'react-native-web',
        '^react-native-svg$': '<rootDir>/node_modules/react-native-svg/lib/commonjs/ReactNativeSVG.web.js',
        '^expo-router$': '<rootDir>/tests/web/stubs/expoRouter.tsx',
        '\\.(png|jpg|jpeg|gif|ttf|otf)$': '<rootDir>/tests/web/stubs/file.js',
      },
      globals: { __DEV__: true },
      moduleFileExtensions: ['web.tsx', 'web.ts', 'web.js', 'tsx', 'ts', 'js', 'json'],
      transformIgnorePatterns: [
        'node_modules/(?!(react-native-web|react-native-svg|react-native|@react-native|expo.*|@expo.*)/)',
      ],
    },
  ],
};
