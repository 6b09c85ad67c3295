/**
 * The demo clinic: Fernbrook Avian Practice, invented, with invented birds and invented
 * procedures over the 180 days before a given day. Nothing here is a real bird or a real
 * measurement: the times of the events are made up so that the clinic's own evidence has
 * something to show. In this invented practice, cockatiels wake and stand later than the
 * population model says (x1.4), African greys a little later (x1.2), pigeons as predicted, and
 * the hens sooner (x0.8); induction is about as predicted. The practice runs its budgerigars
 * and hens on sevoflurane and the other birds on isoflurane, and writes the agent on every
 * record. Seeded: the same seed and day give the same clinic.
 */
import { agentLabels, agents, type AgentId } from '../agents.js';
import { computePlanCourse, type PlanTables } from '../model/compute-plan.js';
import { seededRandom } from '../model/uncertainty.js';
import type { EventType } from '../procedure-events.js';
import type { Route } from '../delivery.js';
import { planInputFromLog, type LoggedEntry, type RecordLog } from './record-log.js';

export const demoClinicName = 'Fernbrook Avian Practice (demo, invented)';

type DemoSpecies = {
  readonly key: string;
  readonly names: readonly string[];
  readonly massG: readonly [number, number];
  readonly records: number;
  /** The invented truth: observed / population model for recovery (first movement, standing). */
  readonly recoveryFactor: number;
  readonly inductionFactor: number;
  readonly intubated: number;
  readonly flowLpm: number;
  /** The agent this invented practice gives the species. */
  readonly agent: AgentId;
};

const demoSpecies: readonly DemoSpecies[] = [
  {
    key: 'cockatiel',
    names: ['Sunny', 'Pepper', 'Mango', 'Kiwi', 'Biscuit', 'Nutmeg', 'Ziggy', 'Clover'],
    massG: [82, 118],
    records: 16,
    recoveryFactor: 1.4,
    inductionFactor: 1.1,
    intubated: 0.6,
    flowLpm: 0.8,
    agent: 'isoflurane',
  },
  {
    key: 'budgerigar',
    names: ['Blue', 'Skye', 'Pip', 'Tweed', 'Bean', 'Juno'],
    massG: [30, 48],
    records: 12,
    recoveryFactor: 1.0,
    inductionFactor: 1.0,
    intubated: 0,
    flowLpm: 0.5,
    agent: 'sevoflurane',
  },
  {
    key: 'african-grey-parrot',
    names: ['Oscar', 'Grace', 'Rufus', 'Ebony'],
    massG: [400, 520],
    records: 10,
    recoveryFactor: 1.2,
    inductionFactor: 0.9,
    intubated: 0.9,
    flowLpm: 1,
    agent: 'isoflurane',
  },
  {
    key: 'domestic-pigeon',
    names: ['Dove', 'Slate', 'Ash', 'Flint'],
    massG: [280, 400],
    records: 10,
    recoveryFactor: 1.0,
    inductionFactor: 1.0,
    intubated: 0.8,
    flowLpm: 1,
    agent: 'isoflurane',
  },
  {
    key: 'chicken',
    names: ['Henrietta', 'Marigold', 'Pearl', 'Custard'],
    massG: [1500, 2400],
    records: 8,
    recoveryFactor: 0.8,
    inductionFactor: 1.0,
    intubated: 1,
    flowLpm: 1.5,
    agent: 'sevoflurane',
  },
  {
    key: 'blue-fronted-amazon',
    names: ['Rio', 'Lulu'],
    massG: [350, 480],
    records: 4,
    recoveryFactor: 1.1,
    inductionFactor: 1.0,
    intubated: 1,
    flowLpm: 1,
    agent: 'isoflurane',
  },
];

/** What the demo clinic holds, as the screens describe it before it is written. */
export const demoClinicSize = {
  birds: demoSpecies.reduce((total, species) => total + species.names.length, 0),
  species: demoSpecies.length,
  records: demoSpecies.reduce((total, species) => total + species.records, 0),
  /** The records fall within this many days before the day the demo is written. */
  days: 180,
} as const;

const procedures = [
  'Wing radiograph',
  'Beak and nail trim',
  'Blood sampling',
  'Endoscopy',
  'Wound repair',
  'Feather cyst removal',
  'Coelomic ultrasound',
];
const staff = ['AK', 'BT', 'CM'];

export type DemoEntry = {
  readonly at: string;
  readonly kind: 'vitals' | 'event';
  readonly vaporPct: number | null;
  readonly oxygenLpm: number | null;
  readonly heartRatePerMin: number | null;
  readonly breathsPerMin: number | null;
  readonly temperatureC: number | null;
  readonly eventType: EventType | null;
};

export type DemoRecord = {
  readonly patientIndex: number;
  readonly startedAt: string;
  readonly endedAt: string;
  readonly procedureName: string;
  readonly airway: Route;
  /** The agent given, written on the record. */
  readonly agent: AgentId;
  readonly staffInitials: string;
  readonly entries: readonly DemoEntry[];
};

export type DemoPatient = {
  readonly name: string;
  readonly speciesKey: string;
  readonly massG: number;
  readonly weighedOn: string;
};

export type DemoClinic = {
  readonly patients: readonly DemoPatient[];
  readonly records: readonly DemoRecord[];
};

/** Box-Muller normal from the seeded generator. */
function normal(random: () => number): number {
  const u = Math.max(random(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random());
}

const minute = 60_000;
const round1 = (value: number) => Math.round(value * 10) / 10;

/**
 * The invented demo clinic: about 60 completed procedures, plus the patients they belong to.
 * @param seed any integer
 * @param endDay the last day of the demo period, YYYY-MM-DD (the day the demo is made)
 * @param tables the species reference the model reads (the event times are placed from its answer)
 */
export function generateDemoClinic(seed: number, endDay: string, tables: PlanTables): DemoClinic {
  const random = seededRandom(seed);
  const endMs = Date.parse(`${endDay}T00:00:00Z`);
  const patients: DemoPatient[] = [];
  const records: DemoRecord[] = [];
  for (const species of demoSpecies) {
    const firstPatient = patients.length;
    for (const name of species.names) {
      const massG = Math.round(species.massG[0] + random() * (species.massG[1] - species.massG[0]));
      patients.push({
        name,
        speciesKey: species.key,
        massG,
        weighedOn: new Date(endMs - 181 * 86_400_000).toISOString().slice(0, 10),
      });
    }
    for (let index = 0; index < species.records; index += 1) {
      const patientIndex = firstPatient + (index % species.names.length);
      const patient = patients[patientIndex] as DemoPatient;
      const dayOffset = 1 + Math.floor(random() * 179);
      const startMs = endMs - dayOffset * 86_400_000 + (8 * 60 + Math.floor(random() * 480)) * minute;
      const intubated = random() < species.intubated;
      // Dials in the agent's own potency: isoflurane's scaled by the ratio of the fallback MACs
      // (in steps of 0.5 and 0.25 %, at most 8 %: the usual vaporiser's top mark).
      const potency = agents[species.agent].fallbackMacPct.value / agents.isoflurane.fallbackMacPct.value;
      const inductionDial = Math.min(8, Math.round((4 + Math.round(random() * 2) / 2) * potency * 2) / 2);
      const maintenanceMin = 15 + Math.floor(random() * 40);
      const gasOnMs = startMs + 2 * minute;
      const flow = species.flowLpm;
      const entries: LoggedEntry[] = [];
      const vitals = (ms: number, dial: number | null): LoggedEntry => ({
        atMs: ms,
        kind: 'vitals',
        vaporPct: dial,
        oxygenLpm: flow,
        heartRatePerMin: Math.round(
          (patient.massG < 200 ? 420 : patient.massG < 1000 ? 260 : 200) * (0.9 + 0.2 * random()),
        ),
        breathsPerMin: Math.round(
          (patient.massG < 200 ? 40 : patient.massG < 1000 ? 24 : 14) * (0.8 + 0.3 * random()),
        ),
        eventType: null,
      });
      const event = (ms: number, eventType: EventType): LoggedEntry => ({
        atMs: Math.round(ms / 1000) * 1000,
        kind: 'event',
        vaporPct: null,
        oxygenLpm: null,
        heartRatePerMin: null,
        breathsPerMin: null,
        eventType,
      });
      entries.push(vitals(gasOnMs, inductionDial));
      const maintenanceDial = Math.round((2 + Math.round(random() * 4) / 4) * potency * 4) / 4;
      for (let at = 5; at <= maintenanceMin; at += 5)
        entries.push(
          vitals(
            gasOnMs + at * minute,
            at === 5 ? maintenanceDial : round1(maintenanceDial + (random() - 0.5) * 0.5),
          ),
        );
      const offMs = gasOnMs + (maintenanceMin + 2) * minute;
      entries.push(event(offMs, 'vaporiserOff'));
      const log: RecordLog = {
        startedAtMs: startMs,
        endedAtMs: null,
        airway: intubated ? 'endotracheal' : 'mask',
        circuit: 'nonRebreathing',
        bird: {
          bodyMassG: patient.massG,
          speciesId: species.key,
          agent: species.agent,
          agentBasis: `${agentLabels[species.agent]}, logged on the record`,
        },
        entries: intubated ? [...entries, event(gasOnMs + 4 * minute, 'intubation')] : entries,
      };
      const plan = planInputFromLog(log);
      if (!plan.ok) continue;
      const predicted = computePlanCourse(plan.input, tables).milestones;
      const noise = () => Math.exp(0.3 * normal(random));
      const lossOfRighting = (predicted.lossOfRightingMin ?? 1) * species.inductionFactor * noise();
      entries.push(event(gasOnMs + lossOfRighting * minute, 'induction'));
      if (intubated) {
        const depth = Math.max(
          lossOfRighting + 0.5,
          (predicted.surgicalDepthMin ?? 3) * species.inductionFactor * noise(),
        );
        entries.push(event(gasOnMs + Math.min(depth, 4.5) * minute, 'intubation'));
      }
      const firstMovement = (predicted.firstMovementMin ?? 3) * species.recoveryFactor * noise();
      const standing = Math.max(
        firstMovement + 1,
        (predicted.standingMin ?? 10) * species.recoveryFactor * noise(),
      );
      entries.push(event(offMs + firstMovement * minute, 'firstMovement'));
      if (intubated) entries.push(event(offMs + (firstMovement + 0.5) * minute, 'extubation'));
      // One record in twelve: standing was not logged (the evidence view counts it as skipped).
      if (index % 12 !== 11) entries.push(event(offMs + standing * minute, 'standing'));
      const endedMs = offMs + (standing + 5) * minute;
      records.push({
        patientIndex,
        startedAt: new Date(startMs).toISOString(),
        endedAt: new Date(Math.round(endedMs / minute) * minute).toISOString(),
        procedureName: procedures[Math.floor(random() * procedures.length)] as string,
        airway: intubated ? 'endotracheal' : 'mask',
        agent: species.agent,
        staffInitials: staff[Math.floor(random() * staff.length)] as string,
        entries: entries
          .sort((a, b) => a.atMs - b.atMs)
          .map((entry) => ({
            at: new Date(entry.atMs).toISOString(),
            kind: entry.kind,
            vaporPct: entry.vaporPct,
            oxygenLpm: entry.oxygenLpm,
            heartRatePerMin: entry.heartRatePerMin,
            breathsPerMin: entry.breathsPerMin,
            temperatureC: entry.kind === 'vitals' ? round1(40 + random()) : null,
            eventType: entry.eventType,
          })),
      });
    }
  }
  records.sort((a, b) => a.startedAt.localeCompare(b.startedAt));
  return { patients, records };
}
