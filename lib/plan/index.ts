/** Ranking, exact capital plan and swap schedule: pure functions, no database or React. */
export * from './ranking';
export * from './knapsack';
export * from './capital-plan';
export * from './schedule';
export * from './fiscal-year';
