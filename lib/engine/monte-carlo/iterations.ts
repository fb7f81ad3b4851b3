/**
 * Monte Carlo iterations over a validated case: each iteration draws every
 * driver from its distribution and, when asked, each engine life's failure
 * age from its Weibull law, then evaluates the npvs on the lean path.
 *
 * Iteration i has its own generator, seeded from (seed, i): the same seed
 * gives the same numbers however the iterations are split among workers.
 */
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import type { CaseFileInput } from '@/lib/validation/case';
import { createCaseNpvs, createNpvWorkspace, evaluateNpvsInto, type CaseNpvs, type NpvWorkspace } from '../npv-only';
import type { Engine } from '@/lib/validation/case';
import { cumulativeHazard, unitExponential, weibullAgeFromExponential } from '../reliability';
import { clampDriver, cloneCase, getDriver, parseDriverId, setDriver, type DriverRef } from '../sensitivity/drivers';
import type { FailureAgeSource } from '../simulate';
import type { PolicyKey } from '../types';
import { sampleDistribution, type Distribution } from './distributions';

export interface MonteCarloSpec {
  iterations: number;
  seed: number;
  /** driver id → distribution; drivers not listed keep their value */
  distributions: { driver: string; distribution: Distribution }[];
  /** draw each engine life's failure age from its Weibull law (else the median path) */
  sampleFailures: boolean;
  /**
   * the case's proposal, a policy per truck (lib/cases/proposal.ts): the
   * summaries then add its Δnpv against rebuilding every engine, the policies
   * held fixed in every iteration; the iterations themselves do not read it
   */
  proposal?: Readonly<Record<string, PolicyKey>> | null;
}

/** Per iteration and truck, the npvs of keep, rebuild and repower: index (i·trucks + t)·3 + policy. */
export const POLICY_SLOTS = 3;

/**
 * A 32-bit seed for iteration i from the run's seed (the murmur3 finaliser
 * over a golden-ratio step), so neighbouring iterations get unrelated streams.
 */
export function iterationSeed(seed: number, i: number): number {
  let h = (seed ^ Math.imul(i + 1, 0x9e3779b9)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) | 0;
}

export interface RunControl {
  /** called every `every` iterations with the count done in this call */
  onProgress?: (done: number) => void;
  every?: number;
  /** checked with each progress call; true stops the run (the figures so far are returned) */
  shouldStop?: () => boolean;
  /** write the npvs here (at least (to − from)·trucks·3 long, e.g. a worker's block of a shared buffer) */
  into?: Float64Array;
}

/**
 * Run iterations [from, to) and return their npvs and how many ran.
 * The case must be valid (validateCase) and the spec checked (driver ids exist).
 */
export function runIterations(
  validCase: CaseFileInput,
  spec: MonteCarloSpec,
  from: number,
  to: number,
  control: RunControl = {},
): { npvs: Float64Array; done: number } {
  return new IterationRunner(validCase, spec).run(from, to, control);
}

/**
 * Runs any ranges of one spec's iterations on one working copy of the case:
 * the clone, the drivers, the failure-age cache and the evaluation buffers
 * are made once, then reused by every range it runs (a worker runs its share
 * in many small ranges, taking the next one when it is free, so both workers
 * finish together). A class, not a closure: every runner shares one compiled
 * `run`, already optimised from the previous job in a warm worker.
 */
export class IterationRunner {
  private readonly trucks: number;
  private readonly work: CaseFileInput;
  private readonly active: { ref: DriverRef; dist: Distribution; base: number }[];
  private readonly failures: SampledFailures;
  private readonly result: CaseNpvs;
  private readonly ws: NpvWorkspace;

  /** `validCase` must be valid (validateCase) and `spec` checked (driver ids exist). */
  constructor(
    private readonly validCase: CaseFileInput,
    private readonly spec: MonteCarloSpec,
  ) {
    this.trucks = validCase.trucks.length;
    this.work = cloneCase(validCase);
    // without sampled failures an iteration follows the median path (an expectation per iteration would
    // re-tabulate every engine drawn), as the spec says
    if (!spec.sampleFailures) this.work.assumptions.valuation = 'median-path';
    this.active = spec.distributions
      .filter((d) => d.distribution.kind !== 'fixed')
      .map((d) => {
        const ref = parseDriverId(d.driver);
        return { ref, dist: d.distribution, base: getDriver(validCase, ref) };
      });
    this.failures = new SampledFailures(this.trucks);
    this.result = createCaseNpvs(this.trucks);
    this.ws = createNpvWorkspace();
  }

  /** Iterations [from, to), as `runIterations`. */
  run(from: number, to: number, control: RunControl = {}): { npvs: Float64Array; done: number } {
    const { trucks, work, validCase, spec, active, failures, result, ws } = this;
    const npvs = control.into ?? new Float64Array((to - from) * trucks * POLICY_SLOTS);
    if (npvs.length < (to - from) * trucks * POLICY_SLOTS) throw new RangeError('runIterations: the output buffer is too short');
    const every = control.every ?? 100;
    let done = 0;
    for (let i = from; i < to; i++) {
      const rng = xoroshiro128plus(iterationSeed(spec.seed, i));
      for (const a of active) setDriver(work, validCase, a.ref, clampDriver(a.ref, sampleDistribution(a.dist, uniformFloat64(rng), a.base)));
      if (spec.sampleFailures) failures.start(rng);
      evaluateNpvsInto(work, spec.sampleFailures ? failures : null, result, ws);
      const off = (i - from) * trucks * POLICY_SLOTS;
      for (let t = 0; t < trucks; t++) {
        npvs[off + t * 3] = result.keep[t];
        npvs[off + t * 3 + 1] = result.rebuild[t];
        npvs[off + t * 3 + 2] = result.repower[t];
      }
      done++;
      if (done % every === 0) {
        control.onProgress?.(done);
        if (control.shouldStop?.()) break;
      }
    }
    const length = done * trucks * POLICY_SLOTS;
    if (control.into) return { npvs: npvs.subarray(0, length), done };
    return { npvs: done === to - from ? npvs : npvs.slice(0, length), done };
  }
}

type RandomGenerator = ReturnType<typeof xoroshiro128plus>;

/**
 * The failure ages of one iteration: one uniform per (truck, engine life),
 * drawn from the iteration's generator when a policy first reaches that life
 * and shared by the three policies (common random numbers: the same engine
 * life fails at the same quantile whatever the policy), kept as its unit
 * exponential e = −ln(1 − u). Each age is `sampleWeibullAge` of that uniform,
 * the same number, with three savings:
 * - the age drawn for (truck, life, engine, start age) is kept: the policies
 *   often ask for the same one (life 0 always; keep and rebuild after that).
 *   Two slots per (truck, life): a truck's lives after the first run on one of
 *   two engines; a third combination is simply not cached;
 * - the hazard (a/η)^β a truck's first life starts with is kept from one
 *   iteration to the next while its age and the law stay the same;
 * - rebuild and repower only compare a new engine's failure age with its
 *   planned life: when e exceeds the planned life's hazard (L/η)^β by a
 *   margin (1e-9, relative) far above rounding, the age is certainly past L
 *   and is not computed; 2·L stands in for it (never cached, so keep, which
 *   reads ages themselves, always gets the real one).
 * Typed arrays indexed by truck · lives + life, cleared by an epoch stamp.
 */
class SampledFailures implements FailureAgeSource {
  private lives = 8;
  private rng: RandomGenerator = xoroshiro128plus(0);
  private epoch = 0;
  /** unit exponential of (truck, life), valid when eStamp equals the epoch */
  private e: Float64Array;
  private eStamp: Int32Array;
  /** two cached ages per (truck, life) */
  private ageStamp: Int32Array;
  private ageEngine: (Engine | undefined)[];
  private ageStart: Float64Array;
  private age: Float64Array;
  /** per truck: the hazard its first life starts with, and the age, β and η it is for */
  private hazard: Float64Array;
  private hazardAge: Float64Array;
  private hazardShape: Float64Array;
  private hazardScale: Float64Array;
  /** per engine seen this iteration: the hazard at its planned life */
  private plannedEngine: Engine[] = [];
  private plannedStamp: number[] = [];
  private plannedHazard: number[] = [];

  constructor(private readonly trucks: number) {
    this.e = new Float64Array(trucks * this.lives);
    this.eStamp = new Int32Array(trucks * this.lives);
    this.ageStamp = new Int32Array(trucks * this.lives * 2);
    this.ageEngine = new Array(trucks * this.lives * 2).fill(undefined);
    this.ageStart = new Float64Array(trucks * this.lives * 2);
    this.age = new Float64Array(trucks * this.lives * 2);
    this.hazard = new Float64Array(trucks);
    this.hazardAge = new Float64Array(trucks).fill(Number.NaN);
    this.hazardShape = new Float64Array(trucks);
    this.hazardScale = new Float64Array(trucks);
  }

  /** A new iteration drawing from `rng`: forget every uniform and age. */
  start(rng: RandomGenerator): void {
    this.rng = rng;
    this.epoch++;
  }

  ageAt(truckIndex: number, lifeIndex: number, engine: Engine, startAge: number, policy: PolicyKey, _truckId: string): number {
    if (lifeIndex >= this.lives) this.grow(lifeIndex + 1);
    const slot = truckIndex * this.lives + lifeIndex;
    const epoch = this.epoch;
    if (this.eStamp[slot] !== epoch) {
      // lives are reached in order, so the uniforms of a truck are drawn in life order
      this.e[slot] = unitExponential(uniformFloat64(this.rng));
      this.eStamp[slot] = epoch;
    }
    // the engine object is the working case's: drivers change it in place, so it holds the sampled law
    const k = slot * 2;
    if (this.ageStamp[k] === epoch && this.ageStart[k] === startAge && this.ageEngine[k] === engine) return this.age[k];
    if (this.ageStamp[k + 1] === epoch && this.ageStart[k + 1] === startAge && this.ageEngine[k + 1] === engine) return this.age[k + 1];
    const e = this.e[slot];
    const shape = engine.weibullShape;
    const scale = engine.weibullScaleHours;
    let age: number;
    if (startAge === 0) {
      if (policy !== 'keep' && e > this.plannedLifeHazard(engine) * (1 + 1e-9)) return 2 * engine.lifeHours;
      age = weibullAgeFromExponential(e, shape, scale, 0, 0);
    } else {
      age = weibullAgeFromExponential(e, shape, scale, startAge, this.startHazard(truckIndex, startAge, shape, scale));
    }
    const free = this.ageStamp[k] !== epoch ? k : this.ageStamp[k + 1] !== epoch ? k + 1 : -1;
    if (free >= 0) {
      this.ageStamp[free] = epoch;
      this.ageEngine[free] = engine;
      this.ageStart[free] = startAge;
      this.age[free] = age;
    }
    return age;
  }

  /** (a/η)^β of a truck's first life, kept while a, β and η stay the same. */
  private startHazard(truckIndex: number, startAge: number, shape: number, scale: number): number {
    if (this.hazardAge[truckIndex] !== startAge || this.hazardShape[truckIndex] !== shape || this.hazardScale[truckIndex] !== scale) {
      this.hazard[truckIndex] = cumulativeHazard(startAge, shape, scale);
      this.hazardAge[truckIndex] = startAge;
      this.hazardShape[truckIndex] = shape;
      this.hazardScale[truckIndex] = scale;
    }
    return this.hazard[truckIndex];
  }

  /** (L/η)^β of an engine this iteration (its law and life may be drivers). */
  private plannedLifeHazard(engine: Engine): number {
    const list = this.plannedEngine;
    let i = 0;
    while (i < list.length && list[i] !== engine) i++;
    if (i === list.length) {
      list.push(engine);
      this.plannedStamp.push(0);
      this.plannedHazard.push(0);
    }
    if (this.plannedStamp[i] !== this.epoch) {
      this.plannedHazard[i] = cumulativeHazard(engine.lifeHours, engine.weibullShape, engine.weibullScaleHours);
      this.plannedStamp[i] = this.epoch;
    }
    return this.plannedHazard[i];
  }

  /** Room for more lives per truck (a long horizon on short lives): copy into wider rows. */
  private grow(lives: number): void {
    const next = Math.max(lives, this.lives * 2);
    const widen = <T extends Float64Array | Int32Array>(a: T, per: number, make: (n: number) => T): T => {
      const b = make(this.trucks * next * per);
      for (let t = 0; t < this.trucks; t++) b.set(a.subarray(t * this.lives * per, (t + 1) * this.lives * per), t * next * per);
      return b;
    };
    const engines = new Array<Engine | undefined>(this.trucks * next * 2).fill(undefined);
    for (let t = 0; t < this.trucks; t++) {
      for (let j = 0; j < this.lives * 2; j++) engines[t * next * 2 + j] = this.ageEngine[t * this.lives * 2 + j];
    }
    this.e = widen(this.e, 1, (n) => new Float64Array(n));
    this.eStamp = widen(this.eStamp, 1, (n) => new Int32Array(n));
    this.ageStamp = widen(this.ageStamp, 2, (n) => new Int32Array(n));
    this.ageStart = widen(this.ageStart, 2, (n) => new Float64Array(n));
    this.age = widen(this.age, 2, (n) => new Float64Array(n));
    this.ageEngine = engines;
    this.lives = next;
  }
}
