export * from './tokenise';
