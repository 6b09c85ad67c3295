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
 * Pounds per square inch to bar (gauge stays gauge, absolute stays absolute).
 * @param pressurePsi pressure in psi, any finite number
 * @returns pressure in bar
 */
export function psiToBar(pressurePsi: number): number {
  return (pressurePsi * kilopascalsPerPsi) / kilopascalsPerBar;
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

// ---------------------------------------------------------------------------------------------
// Display formatting by the clinic's preferred units.

/** Display units the clinic can choose, declared once (the settings contract reads these lists). */
export const massUnits = ['g', 'kg'] as const;
export const pressureUnits = ['mmHg', 'kPa'] as const;
export const temperatureUnits = ['C', 'F'] as const;
export type MassUnit = (typeof massUnits)[number];
export type PressureUnit = (typeof pressureUnits)[number];
export type TemperatureUnit = (typeof temperatureUnits)[number];

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
 * The unit a body mass is shown in: grams below 1 kg whatever the clinic prefers (a cockatiel is
 * 95 g, never 0.095 kg), the clinic's preference from 1 kg up.
 * @param massG mass in g, 0 or more
 * @param preference the clinic's mass unit
 */
export function bodyMassUnit(massG: number, preference: MassUnit): MassUnit {
  return massG < gramsPerKilogram ? 'g' : preference;
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
 * Mass as the clinic reads it: grams below 1 kg whatever the preference (95 g, not 0.095 kg);
 * from 1 kg, kilograms when the clinic prefers them, else grams with kilograms beside.
 */
export function displayMass(massG: number, preference: MassUnit): string {
  if (bodyMassUnit(massG, preference) === 'kg') return formatMass(massG, 'kg', 3).text;
  const grams = `${Number(massG.toFixed(massG < 100 ? 1 : 0))} g`;
  return massG >= 1000 ? `${grams} (${Number(gToKg(massG).toFixed(2))} kg)` : grams;
}
