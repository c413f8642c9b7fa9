export * from './repair';
export * from './ruleIds';
export * from './schema';
export * from './transitions';
