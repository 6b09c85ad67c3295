import { readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { CalibrationView } from '../../app/contract/evidence-channels.js';
import { planInputSchema, type PlanInput } from '../../app/contract/plan.js';
import { defaultClinicSettings } from '../../app/contract/settings.js';
import { agentIds } from '../../app/core/agents.js';
import { circuits, routes } from '../../app/core/delivery.js';
import { computePlan } from '../../app/core/model/compute-plan.js';
import { sourceKindLabels } from '../../app/core/sourced.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { Sheet } from '../../app/ui/worksheets/sheet.js';
import { writeDemoClinic } from '../../main/back-end/demo-clinic.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { enteredByRw, pipValues } from '../support/clinic-birds.js';

/**
 * The acceptance check of the clinic's words: no text a plan result carries to the screens and
 * the worksheet says "from memory", names the random generator or writes an equation. Equations
 * and the generator live in docs/model.md and docs/model-budget.md.
 */
const forbidden: readonly { readonly what: string; readonly pattern: RegExp }[] = [
  { what: '"from memory"', pattern: /from memory/i },
  { what: 'a generator name', pattern: /mulberry|xorshift|\bPRNG\b/i },
  { what: 'an equation (a word = a word)', pattern: /\b[A-Za-z][\w()]*\s*=\s*[A-Za-z(]/ },
  { what: 'a derivative', pattern: /\bd[A-Za-z]+\s*\/\s*dt\b/ },
  { what: 'a power (M^1.08)', pattern: /\w\s*\^\s*[-\d.(]/ },
  { what: 'a log10 formula', pattern: /\blog10\b|\bintegral of\b/i },
];

/** Every string in a value with its path; `kind` fields are codes the screens turn into words. */
function* strings(value: unknown, path: string): Generator<readonly [string, string]> {
  if (typeof value === 'string') yield [path, value];
  else if (Array.isArray(value))
    for (const [i, item] of value.entries()) yield* strings(item, `${path}[${i}]`);
  else if (value !== null && typeof value === 'object')
    for (const [key, item] of Object.entries(value))
      if (key !== 'kind') yield* strings(item, `${path}.${key}`);
}

function offending(texts: Iterable<readonly [string, string]>): string[] {
  const found: string[] = [];
  for (const [path, text] of texts)
    for (const { what, pattern } of forbidden)
      if (pattern.test(text)) found.push(`${path} has ${what}: ${text}`);
  return found;
}

const examplesDirectory = fileURLToPath(new URL('../../examples/plans/', import.meta.url));
const examples = readdirSync(examplesDirectory)
  .filter((name) => name.endsWith('.json'))
  .map((name) => ({
    name,
    input: planInputSchema.parse(JSON.parse(readFileSync(`${examplesDirectory}${name}`, 'utf8'))),
  }));

/** The example with another agent, route and breathing system: every flow rule and budget basis. */
function variants(input: PlanInput): PlanInput[] {
  const all: PlanInput[] = [];
  for (const agent of agentIds)
    for (const route of routes)
      for (const circuit of circuits)
        all.push({
          ...input,
          agent,
          route,
          circuit,
          chamberVolumeL: input.chamberVolumeL ?? 3,
          maskLeakFraction: route === 'mask' ? 0.2 : input.maskLeakFraction,
          circuitVolumeL: circuit === 'circle' ? 2 : input.circuitVolumeL,
          uncertainty: { samples: 0, seed: 1 },
        });
  return all;
}

describe('the clinic reads citations and kinds, never equations or code words', () => {
  it('has kind labels in plain words', () => {
    expect(offending(Object.entries(sourceKindLabels))).toEqual([]);
  });

  for (const { name, input } of examples) {
    it(`says nothing of the kind in any text of ${name}'s result, with its uncertainty`, () => {
      const result = computePlan(
        { ...input, uncertainty: { samples: 20, seed: 1 } },
        { species: speciesReference },
      );
      expect(offending(strings(result, 'result'))).toEqual([]);
    });

    it(`says nothing of the kind for ${name} with every agent, route and breathing system`, () => {
      const found = new Set<string>();
      for (const variant of variants(input)) {
        const result = computePlan(variant, { species: speciesReference });
        for (const line of offending(strings(result, `${variant.agent}/${variant.route}/${variant.circuit}`)))
          found.add(line);
      }
      expect([...found]).toEqual([]);
    });
  }
});

describe('the printed worksheet in the clinic words', () => {
  const open: ChannelHarness[] = [];
  afterEach(() => open.splice(0).forEach((harness) => harness.close()));
  // The invented demo clinic's calibration, so the calibrated figures and their basis are walked too.
  let calibration: CalibrationView;
  let demo: ChannelHarness;
  beforeAll(async () => {
    demo = openChannelHarness();
    await demo.backEnd.ready;
    await writeDemoClinic(demo.backEnd.clinic, demo.clock.now);
    // Its rows are compared with the model in the background; here, now.
    expect(await demo.backEnd.evidenceBackfill.run()).toBe(60);
    calibration = await demo.answer('evidence:calibration', {});
  }, 60_000);
  afterAll(() => demo.close());

  for (const { name, input } of examples) {
    it(`prints ${name} without "from memory", a generator name or an equation`, async () => {
      const api = openChannelHarness();
      open.push(api);
      const patient = await api.answer('patients:create', {
        values: { ...pipValues, speciesKey: input.speciesId ?? pipValues.speciesKey },
        meta: enteredByRw,
      });
      const saved = await api.answer('plans:save', {
        fields: {
          patientId: patient.id,
          plannedFor: '2026-12-02',
          label: 'Wing radiograph',
          input,
          checklist: {
            asaGrade: 2,
            emergency: false,
            items: {
              fastingAndCrop: 'done',
              hydration: 'done',
              bloods: 'open',
              equipmentLeakCheck: 'done',
              oxygenSupply: 'done',
              scavenging: 'open',
              emergencyCard: 'open',
            },
            notes: '',
          },
        },
        meta: enteredByRw,
      });
      const detail = await api.answer('plans:get', { id: saved.id });
      const markup = renderToStaticMarkup(
        createElement(Sheet, {
          detail,
          drugs: [],
          appVersion: '9.8.7',
          settings: { ...defaultClinicSettings, clinicName: 'Harbour Bird Clinic' },
          printedAt: new Date('2026-12-02T08:00:00Z'),
          calibration,
        }),
      );
      const text = markup
        .replace(/<[^>]*>/g, '\n')
        .replace(/&amp;/g, '&')
        .replace(/&#x27;|&#39;/g, "'")
        .replace(/&quot;/g, '"');
      // The sheet was drawn: the patient, the clinic and a cited basis are in it.
      expect(text).toContain('Harbour Bird Clinic');
      expect(text).toContain('Lasiewski & Calder 1971');
      expect(text).toMatch(/calibrated on \d+ of your|no [A-Za-z -]+ records yet: follows your/);
      const lines = text
        .split('\n')
        .map((line) => line.trim())
        .filter((line) => line !== '');
      expect(offending(lines.map((line, index) => [`sheet line ${String(index)}`, line] as const))).toEqual(
        [],
      );
    });
  }
});
