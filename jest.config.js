/** Jest projects: `server` covers the engine, the API and the server services (node, ts-jest). */
module.exports = {
  testTimeout: 30000,
  projects: [
    {
      displayName: 'server',
      testEnvironment: 'node',
      roots: ['<rootDir>/tests'],
      testMatch: ['<rootDir>/tests/{engine,api,server}/**/*.test.ts'],
      transform: {
        '^.+\\.ts$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }],
      },
      moduleFileExtensions: ['ts', 'js', 'json'],
    },
  ],
};
