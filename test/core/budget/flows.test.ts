import { describe, expect, it } from 'vitest';
import {
  chamberTimeToFractionMin,
  practicalMinimumFlowLpm,
  rebreathingCheck,
  recommendFreshGas,
} from '../../../app/core/budget/flows.js';

describe('chamber wash-in time', () => {
  it('reaches 95 % after three time constants (tau = V / FGF)', () => {
    // tau = volume / flow; 1 - e^-3 = 0.950 of a step change after 3 tau (OpenAnesthesia, "Time constant") [published; derived]
    expect(chamberTimeToFractionMin(6, 2, 1 - Math.exp(-3))).toBeCloseTo(9, 10);
    expect(chamberTimeToFractionMin(6, 2) / 9).toBeCloseTo(1, 2);
  });

  it('reaches 63.2 % after one time constant', () => {
    // 1 - e^-1 = 0.632 after one tau (OpenAnesthesia, "Time constant") [derived]
    expect(chamberTimeToFractionMin(10, 5, 0.632)).toBeCloseTo(2, 2);
  });

  it('halves the time when the flow doubles', () => {
    expect(chamberTimeToFractionMin(8, 4)).toBeCloseTo(chamberTimeToFractionMin(8, 2) / 2, 10);
  });
});

describe('recommended fresh gas flow', () => {
  it('sets 2-3 x minute ventilation on a non-rebreathing system', () => {
    // non-rebreathing 2-3 x minute ventilation [common practice]; 1 kg bird, minute ventilation 284 mL/min
    // (Lasiewski & Calder 1971 at 1 kg, from memory)
    const flow = recommendFreshGas({
      route: 'endotracheal',
      circuit: 'nonRebreathing',
      bodyMassG: 1000,
      minuteVentilationMlMin: 284,
    });
    expect(flow.minimumLpm).toBeCloseTo(0.568, 9);
    expect(flow.recommendedLpm).toBeCloseTo(0.852, 9);
    expect(flow.basis).toMatch(/2-3 x minute ventilation/);
  });

  it('keeps a small bird at the practical floor of 0.5 L/min', () => {
    // practical floor of about 0.5-1 L/min [common practice]
    const flow = recommendFreshGas({
      route: 'mask',
      circuit: 'nonRebreathing',
      bodyMassG: 32,
      minuteVentilationMlMin: 20,
    });
    expect(flow.recommendedLpm).toBe(0.5);
    // 2 x 20 mL/min = 0.04 L/min is below any flow a flowmeter sets: the minimum offered is the
    // practical minimum (assumption, practicalMinimumFlowLpm), while rebreathing starts below 0.04.
    expect(flow.minimumLpm).toBe(practicalMinimumFlowLpm.value);
    const check = rebreathingCheck({
      circuit: 'nonRebreathing',
      freshGasLpm: 0.1,
      minuteVentilationMlMin: 20,
      bodyMassG: 32,
      route: 'endotracheal',
    });
    expect(check.rebreathing).toBe(false);
    expect(check.rebreathingBelowLpm).toBeCloseTo(0.04, 9);
    expect(check.minimumLpm).toBe(practicalMinimumFlowLpm.value);
  });

  it('raises the flow to 500 mL/kg/min when that is higher than 3 x minute ventilation', () => {
    // 500 mL/kg/min prevents rebreathing (Massey University, Mapleson D circuits) [published]
    const flow = recommendFreshGas({
      route: 'endotracheal',
      circuit: 'nonRebreathing',
      bodyMassG: 8000,
      minuteVentilationMlMin: 1000,
    });
    expect(flow.recommendedLpm).toBeCloseTo(4, 9);
    expect(flow.basis).toMatch(/Massey University/);
  });

  it('raises a leaking mask flow by 1 / (1 - leak)', () => {
    const tight = recommendFreshGas({
      route: 'mask',
      circuit: 'nonRebreathing',
      bodyMassG: 1000,
      minuteVentilationMlMin: 284,
    });
    const leaky = recommendFreshGas({
      route: 'mask',
      circuit: 'nonRebreathing',
      bodyMassG: 1000,
      minuteVentilationMlMin: 284,
      maskLeakFraction: 0.2,
    });
    expect(leaky.recommendedLpm).toBeCloseTo(tight.recommendedLpm / 0.8, 9);
    expect(leaky.rule).toMatch(/assumption/);
  });

  it('sets a chamber flow that reaches 95 % in the target time', () => {
    // 95 % after 3 tau (OpenAnesthesia, "Time constant"): 5 L in 5 min needs about 3 L/min
    const flow = recommendFreshGas({
      route: 'chamber',
      circuit: 'nonRebreathing',
      bodyMassG: 60,
      minuteVentilationMlMin: 35,
      chamberVolumeL: 5,
      chamberTargetMin: 5,
    });
    expect(flow.recommendedLpm).toBeCloseTo(3, 2);
    expect(chamberTimeToFractionMin(5, flow.recommendedLpm)).toBeCloseTo(5, 9);
    expect(chamberTimeToFractionMin(5, flow.minimumLpm)).toBeCloseTo(10, 9);
  });

  it('asks for the chamber volume on the chamber route', () => {
    expect(() =>
      recommendFreshGas({
        route: 'chamber',
        circuit: 'nonRebreathing',
        bodyMassG: 60,
        minuteVentilationMlMin: 35,
      }),
    ).toThrow(/chamberVolumeL/);
  });

  it('gives a circle at least the minute ventilation and a flow that follows dial changes', () => {
    // tau = volume / flow (OpenAnesthesia, "Time constant"); circle rule is an assumption of ours
    const flow = recommendFreshGas({
      route: 'endotracheal',
      circuit: 'circle',
      bodyMassG: 9000,
      minuteVentilationMlMin: 1500,
      circuitVolumeL: 6,
      circleTargetMin: 10,
    });
    expect(flow.recommendedLpm).toBeCloseTo(Math.max(1.5, (-Math.log(0.05) * 6) / 10), 9);
    expect(flow.minimumLpm).toBe(0.5);
    expect(flow.kind).toBe('assumption');
  });

  it('treats an air-sac tube as non-rebreathing even when a circle is chosen', () => {
    const flow = recommendFreshGas({
      route: 'airSacTube',
      circuit: 'circle',
      bodyMassG: 1000,
      minuteVentilationMlMin: 284,
    });
    expect(flow.minimumLpm).toBeCloseTo(0.568, 9);
    expect(flow.rule).toMatch(/air-sac tube/);
  });
});

describe('rebreathing check', () => {
  it('flags a non-rebreathing system below 2 x minute ventilation and clears it above', () => {
    // non-rebreathing 2-3 x minute ventilation [common practice]
    const low = rebreathingCheck({
      circuit: 'nonRebreathing',
      freshGasLpm: 0.5,
      minuteVentilationMlMin: 300,
      bodyMassG: 1000,
    });
    expect(low.rebreathing).toBe(true);
    expect(low.flowToMinuteVentilationRatio).toBeCloseTo(0.5 / 0.3, 9);
    expect(low.reason).toMatch(/below the 2 x/);
    const enough = rebreathingCheck({
      circuit: 'nonRebreathing',
      freshGasLpm: 0.6,
      minuteVentilationMlMin: 300,
      bodyMassG: 1000,
    });
    expect(enough.rebreathing).toBe(false);
  });

  it('never flags a circle, which rebreathes through its absorber by design', () => {
    const circle = rebreathingCheck({
      circuit: 'circle',
      freshGasLpm: 0.5,
      minuteVentilationMlMin: 1500,
      bodyMassG: 9000,
    });
    expect(circle.rebreathing).toBe(false);
    expect(circle.reason).toMatch(/absorber/);
  });

  it('reports a flow below the practical floor separately from rebreathing', () => {
    // practical floor of about 0.5-1 L/min [common practice]
    const tiny = rebreathingCheck({
      circuit: 'nonRebreathing',
      freshGasLpm: 0.3,
      minuteVentilationMlMin: 20,
      bodyMassG: 30,
    });
    expect(tiny.rebreathing).toBe(false);
    expect(tiny.belowPracticalFloor).toBe(true);
  });
});
