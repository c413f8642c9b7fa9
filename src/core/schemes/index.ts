export * from './codec';
export * from './tag';
