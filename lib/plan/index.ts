/** Ranking, the fleet programme's plan shapes, months and fiscal years: pure functions, no database or React. */
export * from './ranking';
export * from './capital-plan';
export * from './schedule';
export * from './fiscal-year';
