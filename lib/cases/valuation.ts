/** How the screens name the valuation a case's figures are (MODEL.md section 11). Pure. */
import type { Valuation } from './types';

export const VALUATION_LABEL: Record<Valuation, string> = {
  expected: 'Expected over engine failures',
  'median-path': 'Median failure path',
};

/** One line saying what the figures are. */
export const VALUATION_NOTE: Record<Valuation, string> = {
  expected:
    'Every figure is the average over the ages at which the engines may fail in service (their Weibull laws), so event counts are expected numbers and may be fractions.',
  'median-path': 'Every engine is taken to fail at its median failure age (half fail sooner, half later): one path of whole events.',
};

/** The headline marker's label on the Monte Carlo histogram. */
export const HEADLINE_LABEL: Record<Valuation, string> = {
  expected: 'Headline (expected over failures)',
  'median-path': 'Headline (median path)',
};
