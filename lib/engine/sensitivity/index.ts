export * from './drivers';
export * from './metric';
export * from './analyses';
export * from './break-even';
export * from './touched';
export * from './ranges';
export { findRoot } from './root';
