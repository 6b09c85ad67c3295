/** Plain-text pieces of the worksheet: the plan's settings and the monitoring targets in words. */
import type { PlanInput } from '../../contract/plan.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { ippvText } from '../../core/model/ippv-periods.js';
import { cToF, formatPressure } from '../../core/units.js';
import { figure } from './labels.js';

/** The vaporiser schedule as one line, e.g. `0 min: 4 %; 30 min: 0 % (off)`. */
export function scheduleText(input: PlanInput): string {
  return input.schedule
    .map(
      (step) => `${figure(step.atMin)} min: ${figure(step.vaporPct)} %${step.vaporPct === 0 ? ' (off)' : ''}`,
    )
    .join('; ');
}

/** Spontaneous breathing or the IPPV settings of each period, in words. */
export function ventilationText(input: PlanInput): string {
  const ventilation = input.ventilation ?? { mode: 'spontaneous' as const };
  if (ventilation.mode === 'spontaneous') return 'Spontaneous breathing';
  return ippvText(ventilation, figure, 'long');
}

/** The oxygen cylinder as entered (content in L, water capacity and bar, or a preset with its gauge). */
export function cylinderText(input: PlanInput): string {
  const cylinder = input.cylinder;
  if (cylinder === undefined) return 'not given';
  if (cylinder.kind === 'content') return `${figure(cylinder.contentL)} L of oxygen`;
  if (cylinder.kind === 'waterCapacity')
    return `${figure(cylinder.waterCapacityL)} L water capacity at ${figure(cylinder.pressureBar)} bar`;
  const names = {
    'us-e': 'US E cylinder',
    'metric-2l-200bar': '2 L cylinder at 200 bar',
    'metric-10l-200bar': '10 L cylinder at 200 bar',
  } as const;
  const gauge =
    cylinder.gaugePressureBar !== undefined
      ? `, gauge ${figure(cylinder.gaugePressureBar)} bar`
      : cylinder.gaugePressurePsi !== undefined
        ? `, gauge ${figure(cylinder.gaugePressurePsi)} psi`
        : ', full';
  return `${names[cylinder.presetId]}${gauge}`;
}

/** Chamber, circle, mask dead space and leak, where given (the plan's own, or a later phase's). */
export function deliveryDetails(
  input: Pick<PlanInput, 'chamberVolumeL' | 'circuitVolumeL' | 'maskDeadSpaceMl' | 'maskLeakFraction'>,
): string[] {
  const details: string[] = [];
  if (input.chamberVolumeL !== undefined) details.push(`chamber ${figure(input.chamberVolumeL)} L`);
  if (input.circuitVolumeL !== undefined) details.push(`circle volume ${figure(input.circuitVolumeL)} L`);
  if (input.maskDeadSpaceMl !== undefined)
    details.push(`mask dead space ${figure(input.maskDeadSpaceMl)} mL`);
  if (input.maskLeakFraction !== undefined)
    details.push(`mask leak ${figure(input.maskLeakFraction * 100)} %`);
  return details;
}

/** The acceptable cloacal temperature range in the clinic's unit. */
export function temperatureRangeText(settings: ClinicSettings): string {
  // Acceptable cloacal temperature 38.3-40.6 C (published clinical reviews).
  return settings.temperatureUnit === 'C' ? '38.3-40.6 °C' : `${figure(cToF(38.3))}-${figure(cToF(40.6))} °F`;
}

/** The EtCO2 target range in the clinic's pressure unit. */
export function etco2RangeText(settings: ClinicSettings): string {
  // EtCO2 target 30-45 mmHg (published clinical reviews).
  return `${formatPressure(30, settings.pressureUnit, 2).value}-${formatPressure(45, settings.pressureUnit, 2).text}`;
}
