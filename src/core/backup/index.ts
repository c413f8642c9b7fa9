export * from './decode';
export * from './encode';
export * from './model';
