export * from './offsets';
export * from './tokenise';
export * from './stops';
