export * from './decode';
export * from './dismissed';
export * from './encode';
export * from './model';
export { backupModelFileCheck, type ModelFileVerdict } from './project-extras';
