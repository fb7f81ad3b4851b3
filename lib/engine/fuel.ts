/**
 * Fuel burn and CO2 (MODEL.md section 4).
 *
 * The duty is the truck's: power demand P = loadFactor · ratedKw of the
 * engine fitted at the start, the same whichever engine is fitted later. An
 * engine's modelled burn is P · BSFC / (1000 · density); a measured burn on
 * the truck calibrates every engine's modelled burn on it by the same factor.
 */

/**
 * Power demand of a truck's duty, kW: P = loadFactor · ratedKw.
 *
 * @example powerDemandKw(0.5, 2000) // = 1000
 */
export function powerDemandKw(loadFactor: number, ratedKw: number): number {
  return loadFactor * ratedKw;
}

/**
 * Modelled fuel burn, litres per hour: P[kW] · BSFC[g/kWh] / (1000 g/kg · density[kg/L]).
 *
 * @example modelledBurnLitresPerHour(1000, 210, 0.835) // ≈ 251.497
 */
export function modelledBurnLitresPerHour(powerKw: number, bsfcGPerKwh: number, densityKgPerL: number): number {
  return (powerKw * bsfcGPerKwh) / (1000 * densityKgPerL);
}

/**
 * Calibration factor k = measured / modelled burn of the truck's engine at the
 * start; 1 when nothing is measured (null).
 *
 * @example calibrationFactor(240, 250) // = 0.96
 */
export function calibrationFactor(measuredLitresPerHour: number | null | undefined, modelledLitresPerHour: number): number {
  return measuredLitresPerHour == null ? 1 : measuredLitresPerHour / modelledLitresPerHour;
}

/**
 * CO2 from burning diesel, tonnes: litres · kgPerLitre / 1000.
 * 2.697 kg/L is the US EPA factor (10.21 kg per US gallon).
 *
 * @example co2Tonnes(1000, 2.697) // = 2.697
 */
export function co2Tonnes(litres: number, co2KgPerLitre: number): number {
  return (litres * co2KgPerLitre) / 1000;
}
