export * from './mask';
