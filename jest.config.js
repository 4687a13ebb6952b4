/** One `npx jest` runs the pure rules, the server over HTTP, and the components. */
const alias = { '^@/(.*)$': '<rootDir>/$1' };

module.exports = {
  // Generous: the suite also runs on a busy two-core CI machine; nothing here measures speed.
  testTimeout: 60_000,
  projects: [
    {
      displayName: 'server',
      testEnvironment: 'node',
      testMatch: ['<rootDir>/tests/shared/**/*.test.ts', '<rootDir>/tests/server/**/*.test.ts', '<rootDir>/tests/reference/**/*.test.ts'],
      transform: { '^.+\\.[jt]sx?$': 'babel-jest' },
      moduleNameMapper: alias,
    },
    {
      displayName: 'client',
      // The native preset: @testing-library/react-native queries React Native's host
      // components (Text, TextInput), which the web preset replaces with DOM elements.
      preset: 'jest-expo',
      testMatch: ['<rootDir>/tests/components/**/*.test.tsx'],
      moduleNameMapper: alias,
    },
  ],
};
