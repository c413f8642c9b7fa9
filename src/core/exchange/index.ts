export * from './assign';
export * from './layers';
export * from './lines';
export * from './merge';
export * from './model';
export * from './pack';
export * from './sha256';
