export * from './context';
export * from './decisions';
export * from './diff';
export * from './draft';
export * from './layer-repair';
