export * from './distributions';
export * from './iterations';
export * from './stats';
