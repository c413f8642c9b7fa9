export * from './draft';
export * from './keys';
export * from './names';
export * from './palette';
export * from './propose';
export * from './schema-ops';
export * from './tags-edit';
export * from './validate';
