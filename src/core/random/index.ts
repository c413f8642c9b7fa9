export * from './mulberry32';
