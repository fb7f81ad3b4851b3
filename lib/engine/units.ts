/**
 * Unit conversions for display, on mathjs (kept out of the engine's hot
 * loops, which work in SI-style units: kW, L, g/kWh, L/h).
 *
 * The horsepower is the mechanical one, 550 ft·lbf/s = 745.699 871 582 W
 * (NIST SP 811, B.8); mathjs's own `hp` is 745.6998715386 W, so it is
 * defined here from its definition. The gallon is the US liquid gallon,
 * 231 in³ = 3.785 411 784 L; the pound is 0.453 592 37 kg.
 */
import { create, all, type MathJsInstance } from 'mathjs';

let instance: MathJsInstance | null = null;

function math(): MathJsInstance {
  if (!instance) {
    instance = create(all, {});
    instance.createUnit('mechhp', { definition: '550 ft lbf / s' });
  }
  return instance;
}

function convert(value: number, from: string, to: string): number {
  return math().unit(value, from).toNumber(to);
}

/** kW → mechanical hp. @example kwToHp(0.745699872) // ≈ 1 */
export function kwToHp(kw: number): number {
  return convert(kw, 'kW', 'mechhp');
}
/** Mechanical hp → kW. @example hpToKw(1) // ≈ 0.745699872 */
export function hpToKw(hp: number): number {
  return convert(hp, 'mechhp', 'kW');
}
/** Litres → US gallons. @example litresToUsGallons(3.785411784) // = 1 */
export function litresToUsGallons(litres: number): number {
  return convert(litres, 'L', 'gal');
}
/** US gallons → litres. @example usGallonsToLitres(1) // = 3.785411784 */
export function usGallonsToLitres(gallons: number): number {
  return convert(gallons, 'gal', 'L');
}
/** BSFC g/kWh → lb/hp-h. @example gPerKwhToLbPerHpH(225.7) // ≈ 0.371 */
export function gPerKwhToLbPerHpH(gPerKwh: number): number {
  return convert(gPerKwh, 'g / (kW h)', 'lb / (mechhp h)');
}
/** BSFC lb/hp-h → g/kWh. @example lbPerHpHToGPerKwh(0.371) // ≈ 225.67 */
export function lbPerHpHToGPerKwh(lbPerHpH: number): number {
  return convert(lbPerHpH, 'lb / (mechhp h)', 'g / (kW h)');
}
/** Burn L/h → US gal/h. @example litresPerHourToGallonsPerHour(3.785411784) // = 1 */
export function litresPerHourToGallonsPerHour(litresPerHour: number): number {
  return convert(litresPerHour, 'L / h', 'gal / h');
}
/** Burn US gal/h → L/h. @example gallonsPerHourToLitresPerHour(1) // = 3.785411784 */
export function gallonsPerHourToLitresPerHour(gallonsPerHour: number): number {
  return convert(gallonsPerHour, 'gal / h', 'L / h');
}
