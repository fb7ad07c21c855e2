export * from './capability';
export * from './control';
export * from './distributions';
