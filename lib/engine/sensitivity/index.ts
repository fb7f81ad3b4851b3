export * from './drivers';
export * from './metric';
export * from './analyses';
export * from './break-even';
export { findRoot } from './root';
