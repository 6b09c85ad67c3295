/**
 * Unit conversions used by the model and the screens, and display formatting by the clinic's
 * preferred units.
 *
 * Every conversion is a pure function of its inputs. Constants are exact definitions unless a
 * comment says otherwise. The mmHg used here equals the torr (101.325/760 kPa); the
 * conventional mmHg (13.5951 g/cm3 mercury) differs from it by about 1.4e-7, far below any
 * clinical reading, and this choice keeps 760 mmHg exactly one standard atmosphere, which the
 * agent tables and vapour-pressure equations assume.
 */

/** Grams in one kilogram. */
export const gramsPerKilogram = 1000;

/** Millilitres in one litre. */
export const millilitresPerLitre = 1000;

/** Litres in one cubic metre. */
export const litresPerCubicMetre = 1000;

/** Minutes in one hour. */
export const minutesPerHour = 60;

/** Kilopascals in one standard atmosphere (definition). */
export const kilopascalsPerAtmosphere = 101.325;

/** Millimetres of mercury in one standard atmosphere (definition of the torr). */
export const millimetresMercuryPerAtmosphere = 760;

/** Kilopascals per bar (definition). */
export const kilopascalsPerBar = 100;

/** Kilopascals per pound-force per square inch: 0.45359237 kg x 9.80665 m/s2 / (0.0254 m)^2 (definition). */
export const kilopascalsPerPsi = 6.894757293168;

/**
 * Molar volume of an ideal gas at 25 C and 1 atm in litres per mole, the figure used to turn
 * ppm into mg/m3 for workplace exposure limits (ppm x MW / 24.45).
 */
export const molarVolumeLAt25C = 24.45;

/** Offset between the Celsius and Kelvin scales (definition). */
export const kelvinAtZeroCelsius = 273.15;

/**
 * Grams to kilograms.
 * @param massG mass in g, any finite number
 * @returns mass in kg
 */
export function gToKg(massG: number): number {
  return massG / gramsPerKilogram;
}

/**
 * Kilograms to grams.
 * @param massKg mass in kg, any finite number
 * @returns mass in g
 */
export function kgToG(massKg: number): number {
  return massKg * gramsPerKilogram;
}

/**
 * Millimetres of mercury (taken equal to the torr) to kilopascals.
 * @param pressureMmHg pressure in mmHg, any finite number
 * @returns pressure in kPa
 */
export function mmHgToKpa(pressureMmHg: number): number {
  return (pressureMmHg * kilopascalsPerAtmosphere) / millimetresMercuryPerAtmosphere;
}

/**
 * Kilopascals to millimetres of mercury (taken equal to the torr).
 * @param pressureKpa pressure in kPa, any finite number
 * @returns pressure in mmHg
 */
export function kpaToMmHg(pressureKpa: number): number {
  return (pressureKpa * millimetresMercuryPerAtmosphere) / kilopascalsPerAtmosphere;
}

/**
 * Degrees Celsius to degrees Fahrenheit.
 * @param temperatureC temperature in C, at or above -273.15
 * @returns temperature in F
 */
export function cToF(temperatureC: number): number {
  return (temperatureC * 9) / 5 + 32;
}

/**
 * Degrees Fahrenheit to degrees Celsius.
 * @param temperatureF temperature in F, at or above -459.67
 * @returns temperature in C
 */
export function fToC(temperatureF: number): number {
  return ((temperatureF - 32) * 5) / 9;
}

/**
 * Degrees Celsius to kelvin.
 * @param temperatureC temperature in C, at or above -273.15
 * @returns temperature in K
 */
export function cToK(temperatureC: number): number {
  return temperatureC + kelvinAtZeroCelsius;
}

/**
 * Litres to millilitres.
 * @param volumeL volume in L, any finite number
 * @returns volume in mL
 */
export function lToMl(volumeL: number): number {
  return volumeL * millilitresPerLitre;
}

/**
 * Millilitres to litres.
 * @param volumeMl volume in mL, any finite number
 * @returns volume in L
 */
export function mlToL(volumeMl: number): number {
  return volumeMl / millilitresPerLitre;
}

/**
 * Cubic metres to litres.
 * @param volumeM3 volume in m3, any finite number
 * @returns volume in L
 */
export function m3ToL(volumeM3: number): number {
  return volumeM3 * litresPerCubicMetre;
}

/**
 * Litres to cubic metres.
 * @param volumeL volume in L, any finite number
 * @returns volume in m3
 */
export function lToM3(volumeL: number): number {
  return volumeL / litresPerCubicMetre;
}

/**
 * Minutes to hours.
 * @param durationMin duration in min, any finite number
 * @returns duration in h
 */
export function minToH(durationMin: number): number {
  return durationMin / minutesPerHour;
}

/**
 * Hours to minutes.
 * @param durationH duration in h, any finite number
 * @returns duration in min
 */
export function hToMin(durationH: number): number {
  return durationH * minutesPerHour;
}

/**
 * Pounds per square inch to bar (gauge stays gauge, absolute stays absolute).
 * @param pressurePsi pressure in psi, any finite number
 * @returns pressure in bar
 */
export function psiToBar(pressurePsi: number): number {
  return (pressurePsi * kilopascalsPerPsi) / kilopascalsPerBar;
}

/**
 * Bar to pounds per square inch.
 * @param pressureBar pressure in bar, any finite number
 * @returns pressure in psi
 */
export function barToPsi(pressureBar: number): number {
  return (pressureBar * kilopascalsPerBar) / kilopascalsPerPsi;
}

/**
 * Volume percent of a gas in a mixture to its partial pressure (Dalton's law).
 * @param concentrationPct concentration in vol %, 0 to 100
 * @param barometricMmHg total (barometric) pressure in mmHg, above 0; 760 at sea level
 * @returns partial pressure in mmHg
 */
export function vaporPctToPartialPressureMmHg(
  concentrationPct: number,
  barometricMmHg = millimetresMercuryPerAtmosphere,
): number {
  return (concentrationPct / 100) * barometricMmHg;
}

/**
 * Partial pressure of a gas to its volume percent in the mixture (Dalton's law).
 * @param partialPressureMmHg partial pressure in mmHg, 0 to barometricMmHg
 * @param barometricMmHg total (barometric) pressure in mmHg, above 0; 760 at sea level
 * @returns concentration in vol %
 */
export function partialPressureMmHgToVaporPct(
  partialPressureMmHg: number,
  barometricMmHg = millimetresMercuryPerAtmosphere,
): number {
  return (partialPressureMmHg / barometricMmHg) * 100;
}

/**
 * Volume percent to partial pressure in kPa (Dalton's law).
 * @param concentrationPct concentration in vol %, 0 to 100
 * @param barometricKpa total pressure in kPa, above 0; 101.325 at sea level
 * @returns partial pressure in kPa
 */
export function vaporPctToPartialPressureKpa(
  concentrationPct: number,
  barometricKpa = kilopascalsPerAtmosphere,
): number {
  return (concentrationPct / 100) * barometricKpa;
}

/**
 * Parts per million by volume to milligrams per cubic metre at 25 C and 1 atm
 * (ppm x MW / 24.45, the industrial-hygiene convention).
 * @param concentrationPpm concentration in ppm by volume, 0 or more
 * @param molecularWeightGPerMol molar mass in g/mol, above 0
 * @returns concentration in mg/m3
 */
export function ppmToMgPerM3(concentrationPpm: number, molecularWeightGPerMol: number): number {
  return (concentrationPpm * molecularWeightGPerMol) / molarVolumeLAt25C;
}

/**
 * Milligrams per cubic metre at 25 C and 1 atm to parts per million by volume.
 * @param concentrationMgPerM3 concentration in mg/m3, 0 or more
 * @param molecularWeightGPerMol molar mass in g/mol, above 0
 * @returns concentration in ppm by volume
 */
export function mgPerM3ToPpm(concentrationMgPerM3: number, molecularWeightGPerMol: number): number {
  return (concentrationMgPerM3 * molarVolumeLAt25C) / molecularWeightGPerMol;
}

// ---------------------------------------------------------------------------------------------
// Display formatting by the clinic's preferred units.

export type MassUnit = 'g' | 'kg';
export type PressureUnit = 'mmHg' | 'kPa';
export type TemperatureUnit = 'C' | 'F';

/** The clinic's preferred display units. */
export type UnitPreferences = {
  readonly mass: MassUnit;
  readonly pressure: PressureUnit;
  readonly temperature: TemperatureUnit;
};

/** Default display units: grams, mmHg and Celsius (a choice of ours; the clinic can change it). */
export const defaultUnitPreferences: UnitPreferences = { mass: 'g', pressure: 'mmHg', temperature: 'C' };

/** A number ready for display: the rounded value, its unit string and both joined. */
export type FormattedQuantity = {
  readonly value: number;
  readonly unit: string;
  readonly text: string;
};

/**
 * Rounds to a number of significant digits without ever switching to exponent notation for the
 * magnitudes a clinic sees (1e-6 to 1e9).
 * @param value any finite number
 * @param significantDigits 1 to 15
 */
export function roundToSignificant(value: number, significantDigits: number): number {
  if (!Number.isFinite(value) || value === 0) return value;
  const digits = Math.min(15, Math.max(1, Math.round(significantDigits)));
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  const decimals = digits - 1 - magnitude;
  if (decimals >= 0) return Number(value.toFixed(Math.min(decimals, 100)));
  const scale = 10 ** -decimals;
  return Math.round(value / scale) * scale;
}

/**
 * Joins a number and its unit for display. The number is rounded to `significantDigits`
 * significant digits but never to fewer decimals than needed to keep whole units
 * (so 1234.5 g shows as 1235 g, not 1200 g).
 * @param value any finite number; NaN or infinity are shown as a dash with the unit
 * @param unit the unit string shown after the number
 * @param significantDigits 1 to 15, default 3
 */
export function formatQuantity(value: number, unit: string, significantDigits = 3): FormattedQuantity {
  if (!Number.isFinite(value)) return { value, unit, text: `- ${unit}` };
  const wholeDigits = value === 0 ? 1 : Math.max(1, Math.floor(Math.log10(Math.abs(value))) + 1);
  const rounded = roundToSignificant(value, Math.max(significantDigits, wholeDigits));
  const normalised = Object.is(rounded, -0) ? 0 : rounded;
  return { value: normalised, unit, text: `${String(normalised)} ${unit}` };
}

/**
 * Formats a body or other mass in the clinic's preferred mass unit.
 * @param massG mass in g, 0 or more
 * @param unit 'g' or 'kg'
 * @param significantDigits 1 to 15, default 3
 */
export function formatMass(massG: number, unit: MassUnit, significantDigits = 3): FormattedQuantity {
  return unit === 'g'
    ? formatQuantity(massG, 'g', significantDigits)
    : formatQuantity(gToKg(massG), 'kg', significantDigits);
}

/**
 * Formats a pressure (blood pressure, EtCO2, partial pressure) in the preferred pressure unit.
 * @param pressureMmHg pressure in mmHg
 * @param unit 'mmHg' or 'kPa'
 * @param significantDigits 1 to 15, default 3
 */
export function formatPressure(
  pressureMmHg: number,
  unit: PressureUnit,
  significantDigits = 3,
): FormattedQuantity {
  return unit === 'mmHg'
    ? formatQuantity(pressureMmHg, 'mmHg', significantDigits)
    : formatQuantity(mmHgToKpa(pressureMmHg), 'kPa', significantDigits);
}

/**
 * Formats a temperature in the preferred temperature unit, to a fixed number of decimals
 * (body temperatures are read to a tenth of a degree on either scale).
 * @param temperatureC temperature in C
 * @param unit 'C' or 'F'
 * @param decimals 0 to 3, default 1 (38.5 °C, 101.3 °F)
 */
export function formatTemperature(
  temperatureC: number,
  unit: TemperatureUnit,
  decimals = 1,
): FormattedQuantity {
  const value = unit === 'C' ? temperatureC : cToF(temperatureC);
  const unitText = unit === 'C' ? '°C' : '°F';
  if (!Number.isFinite(value)) return { value, unit: unitText, text: `- ${unitText}` };
  const rounded = Number(value.toFixed(Math.min(3, Math.max(0, Math.round(decimals)))));
  const normalised = Object.is(rounded, -0) ? 0 : rounded;
  return { value: normalised, unit: unitText, text: `${String(normalised)} ${unitText}` };
}
