/**
 * A synthetic fleet for benchmarks and property tests: the demo mine's
 * engines and offers, with trucks spread deterministically over engine hours,
 * annual hours, duty and measured burn. Invented data.
 */
import type { CaseFileInput } from '@/lib/validation/case';

/** Deterministic pseudo-random numbers in [0, 1) (a small LCG), so every run benches the same fleet. */
function lcg(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
}

export function syntheticFleet(base: CaseFileInput, size: number, seed = 1): CaseFileInput {
  const rand = lcg(seed);
  const templates = base.trucks;
  const trucks = Array.from({ length: size }, (_, i) => {
    const t = templates[i % templates.length];
    return {
      ...t,
      id: `S-${String(i + 1).padStart(4, '0')}`,
      engineHours: Math.round(rand() * 26000),
      remainingLifeHours: 30000 + Math.round(rand() * 45000),
      annualHours: 5400 + Math.round(rand() * 1200),
      loadFactor: 0.4 + rand() * 0.18,
      fuelBurnLitresPerHour: null,
    };
  });
  return { ...base, name: `${base.name} (synthetic ${size})`, trucks };
}
