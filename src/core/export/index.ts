export * from './caution';
export * from './check';
export { arrayShuffle, randomMulberry32 } from './random';
export * from './select';
export * from './split';
export * from './types';
export * from './write';
