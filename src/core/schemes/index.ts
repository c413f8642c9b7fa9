export * from './codec';
export * from './detect';
export * from './tag';
