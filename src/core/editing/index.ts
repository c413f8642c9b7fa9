export * from './content';
export * from './selection';
export * from './spans';
export * from './undo';
