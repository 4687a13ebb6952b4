/**
 * Thermal-care rules for Warmfold: pure functions shared by the server and the client.
 * These prompts support the nurse's judgment; they never replace unit policy, the device's
 * instructions or licensed practice. See README.md for each rule's source and certainty.
 */

export * from './errors';
export * from './limits';
export * from './units';
export * from './gap';
export * from './schedule';
export * from './bands';
export * from './heat-stress';
export * from './manual-mode';
export * from './skin-to-skin';
export * from './policy';
export * from './evaluate';
export * from './severity';
