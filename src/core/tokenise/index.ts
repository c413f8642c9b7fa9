export * from './offsets';
export * from './tokenise';
