import { readFile } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { planResultSchema } from '../../app/contract/plan.js';
import { runPlanCommand } from '../../main/cli/plan-command.js';
import { planInputJsonSchemaText, planInputSchemaPath } from '../../main/cli/write-json-schema.js';

const root = new URL('../../', import.meta.url);
const example = 'examples/plans/pip-budgerigar-mask-isoflurane.json';

async function run(args: string[], stdinText = '', files: Record<string, string> = {}) {
  let stdout = '';
  let stderr = '';
  const code = await runPlanCommand(args, {
    stdin: Readable.from([stdinText]),
    stdout: (text) => {
      stdout += text;
    },
    stderr: (text) => {
      stderr += text;
    },
    readFile: async (path) => files[path] ?? (await readFile(new URL(path, root), 'utf8')),
  });
  return { code, stdout, stderr };
}

describe('tidewing plan', () => {
  it('prints the result JSON for a plan file', async () => {
    const { code, stdout, stderr } = await run([example]);
    expect(code).toBe(0);
    expect(stderr).toBe('');
    const parsed = planResultSchema.safeParse(JSON.parse(stdout));
    expect(parsed.success).toBe(true);
    expect(parsed.data?.patientName).toBe('Pip');
  });
  it('reads the plan from standard input with -', async () => {
    const text = await readFile(new URL(example, root), 'utf8');
    const { code, stdout } = await run(['-'], text);
    expect(code).toBe(0);
    expect(JSON.parse(stdout).speciesId).toBe('budgerigar');
  });
  it('prints a short table with --summary', async () => {
    const { code, stdout } = await run([example, '--summary']);
    expect(code).toBe(0);
    expect(stdout).toContain('Air-sac wash-in 95 %');
    expect(() => JSON.parse(stdout)).toThrow();
  });
  it('prints each clinical milestone with its range, its not-reached note and its definition', async () => {
    const { code, stdout } = await run([example, '--summary']);
    expect(code).toBe(0);
    const line = (label: string): string => stdout.split('\n').find((row) => row.startsWith(label)) ?? '';
    // Four milestones, each a figure in minutes (or "not reached ...") with its 5-95 % range.
    for (const label of [
      'Loss of righting ',
      'Planned surgical depth ',
      'First movement or head lift after off ',
      'Standing or perching after off ',
    ]) {
      expect(line(label)).toMatch(
        / {2}(\d+(\.\d+)? min|not reached[^(]*) {2}\(p5-p95 [\d.]+-[\d.]+ min(; not reached by \d+ % of birds like this)?\)$/,
      );
    }
    // The budgerigar example's planned depth is missed by a share of the sampled birds: the note says so.
    expect(line('Planned surgical depth ')).toMatch(/not reached by \d+ % of birds like this/);
    // Definitions as the model states them (app/core/model/parameters.ts; thresholds are assumptions).
    expect(stdout).toContain('Milestones (brain level in the model):');
    expect(stdout).toContain('  Loss of righting: brain reaches 0.6 x MAC (assumption)');
    expect(stdout).toContain("  Planned surgical depth: brain reaches 1.2 x MAC (the plan's depth)");
    expect(stdout).toContain(
      '  First movement or head lift: brain below 0.4 x MAC after the vaporiser is off (assumption)',
    );
    expect(stdout).toContain(
      '  Standing or perching: brain below 0.2 x MAC after the vaporiser is off (assumption)',
    );
  });
  it('prints each phase of a phased plan with its flows, dial steps, oxygen and liquid, and every milestone', async () => {
    const phased = 'examples/plans/sable-african-grey-mask-then-tube-isoflurane.json';
    const { code, stdout, stderr } = await run([phased, '--summary']);
    expect(code).toBe(0);
    expect(stderr).toBe('');
    const lines = stdout.split('\n');
    const at = (prefix: string): number => lines.findIndex((row) => row.startsWith(prefix));
    // The mask phase, then the tube phase after its room-air gap, each with its own flows.
    expect(lines[at('  Phase 1 ')]).toBe('  Phase 1  0-6 min  Face mask, non-rebreathing system');
    expect(lines[at('  Phase 2 ')]).toBe(
      '  Phase 2  6-90 min  0.5 min on room air while the bird is moved, then from 6.5 min: Endotracheal tube, non-rebreathing system',
    );
    for (const phase of [1, 2]) {
      const first = at(`  Phase ${String(phase)} `);
      expect(lines[first + 1]).toMatch(
        /^ {4}Fresh gas \d+\.\d\d L\/min set; recommended \d+\.\d\d L\/min, minimum \d+\.\d\d L\/min/,
      );
      expect(lines[first + 2]).toMatch(/^ {4}Dial \d/);
      expect(lines[first + 3]).toMatch(/^ {4}Oxygen \d+\.\d L, liquid agent \d+\.\d mL$/);
    }
    // The set flows are the plan file's: 1 L/min on the mask, 0.6 L/min on the tube.
    expect(lines[at('  Phase 1 ') + 1]).toContain('Fresh gas 1.00 L/min set');
    expect(lines[at('  Phase 2 ') + 1]).toContain('Fresh gas 0.60 L/min set');
    expect(lines[at('  Phase 1 ') + 2]).toBe('    Dial 5 % from 0 min, 3 % from 2 min');
    expect(lines[at('  Phase 2 ') + 2]).toBe('    Dial 2 % from 6 min, off at 60 min');
    // Every clinical milestone, with its figure.
    for (const label of [
      'Loss of righting ',
      'Planned surgical depth ',
      'First movement or head lift after off ',
      'Standing or perching after off ',
    ])
      expect(lines[at(label)]).toMatch(/ {2}\d+(\.\d+)? min/);
    // The tube's caution is named with its phase.
    expect(stdout).toContain('Phase 2 (Endotracheal tube, from 6 min): Use an uncuffed tube');
  });
  it('prints a single-route plan as one phase', async () => {
    const { code, stdout } = await run([example, '--summary']);
    expect(code).toBe(0);
    expect(stdout).toContain('Phases:\n  Phase 1  0-60 min  Face mask, non-rebreathing system\n');
    expect(stdout).not.toContain('Phase 2');
  });
  it('exits 2 on bad JSON with a message and nothing on standard output', async () => {
    const { code, stdout, stderr } = await run(['-'], '{ "bodyMassG": 32, ');
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toContain('not valid JSON');
  });
  it('exits 2 on a schema failure, naming each bad field and why', async () => {
    const plan = JSON.stringify({
      bodyMassG: 2,
      agent: 'halothane',
      route: 'chamber',
      freshGasLpm: 1,
      schedule: [{ atMin: 0, vaporPct: 4 }],
    });
    const { code, stdout, stderr } = await run(['plan.json'], '', { 'plan.json': plan });
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toContain('bodyMassG: body mass must be between 5 g and 15000 g');
    expect(stderr).toContain('agent: agent must be isoflurane, sevoflurane or desflurane');
  });
  it('exits 2 without a file argument or with an unknown option', async () => {
    expect((await run([])).code).toBe(2);
    const unknown = await run([example, '--fast']);
    expect(unknown.code).toBe(2);
    expect(unknown.stdout).toBe('');
  });
  it('exits 2 when the file cannot be read', async () => {
    const { code, stderr, stdout } = await run(['examples/plans/no-such-plan.json']);
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toContain('cannot read');
  });
});

/** True when the text holds a character a terminal acts on (all but the line feed). */
function hasTerminalControls(text: string): boolean {
  return [...text].some((character) => {
    const code = character.codePointAt(0) ?? 0;
    return (
      (code <= 0x1f && code !== 0x0a) ||
      (code >= 0x7f && code <= 0x9f) ||
      (code >= 0x202a && code <= 0x202e) ||
      code === 0x2028 ||
      code === 0x2029 ||
      (code >= 0xd800 && code <= 0xdfff)
    );
  });
}

describe('tidewing plan with unusual input', () => {
  const kiwi = {
    patientName: 'Kiwi',
    bodyMassG: 95,
    speciesId: 'cockatiel',
    agent: 'isoflurane',
    route: 'chamber',
    freshGasLpm: 2,
    chamberVolumeL: 3,
    schedule: [
      { atMin: 0, vaporPct: 5 },
      { atMin: 10, vaporPct: 0 },
    ],
    scavenging: false,
  };

  it('reads a plan file that starts with a UTF-8 byte-order mark, from a file and from standard input', async () => {
    const text = `\uFEFF${JSON.stringify(kiwi)}`;
    const fromFile = await run(['kiwi.json'], '', { 'kiwi.json': text });
    expect(fromFile.stderr).toBe('');
    expect(fromFile.code).toBe(0);
    expect(JSON.parse(fromFile.stdout).patientName).toBe('Kiwi');
    // The mark as its three UTF-8 bytes, split between two chunks of the stream.
    const bytes = Buffer.from(text, 'utf8');
    let stdout = '';
    const code = await runPlanCommand(['-'], {
      stdin: Readable.from([bytes.subarray(0, 2), bytes.subarray(2)]),
      stdout: (chunk) => {
        stdout += chunk;
      },
      stderr: () => undefined,
      readFile: () => Promise.reject(new Error('not used')),
    });
    expect(code).toBe(0);
    expect(JSON.parse(stdout).patientName).toBe('Kiwi');
  });

  it('refuses an unknown speciesId with exit 2 and a message naming it and the way out', async () => {
    const plan = JSON.stringify({ ...kiwi, speciesId: 'cockateil' });
    const refused = await run(['kiwi.json'], '', { 'kiwi.json': plan });
    expect(refused.code).toBe(2);
    expect(refused.stdout).toBe('');
    expect(refused.stderr).toContain('speciesId "cockateil" is not in the species reference');
    expect(refused.stderr).toContain('cockatiel');
    expect(refused.stderr).toContain('--allow-unknown-species');
    const allowed = await run(['kiwi.json', '--allow-unknown-species'], '', { 'kiwi.json': plan });
    expect(allowed.code).toBe(0);
    expect(JSON.parse(allowed.stdout).cautions.map((caution: { code: string }) => caution.code)).toContain(
      'unknown-species',
    );
  });

  it('escapes escape sequences, control characters and bidi overrides it echoes from the input', async () => {
    const hostile = '\u001b[2J\u001b]0;owned\u0007Pip\u202Egnp.exe\r\n';
    // In a field name (zod names unknown fields in its message) and in the file name.
    const badKey = await run([`plan\u001b[31m.json`], '', {
      [`plan\u001b[31m.json`]: JSON.stringify({ ...kiwi, [hostile]: 1 }),
    });
    expect(badKey.code).toBe(2);
    expect(hasTerminalControls(badKey.stderr)).toBe(false);
    expect(badKey.stderr).toContain('\\x1B[2J\\x1B]0;owned\\x07Pip\\u{202E}gnp.exe\\x0D\\x0A');
    // In a JSON syntax error that quotes the input.
    const badJson = await run(['-'], '{"patientName": "\u001b[31mred\u001b[0m", oops}');
    expect(badJson.code).toBe(2);
    expect(badJson.stderr).not.toContain('\u001b');
    // A patient name with a bidi override or a C1 control is refused (the contract's naming rule),
    // and the refusal names the field without echoing the characters raw.
    const named = { ...kiwi, patientName: 'Ki\u202Ewi\u0085' };
    const refused = await run(['kiwi.json', '--summary'], '', { 'kiwi.json': JSON.stringify(named) });
    expect(refused.code).toBe(2);
    expect(refused.stderr).toContain('patientName');
    expect(refused.stderr).not.toMatch(/[\u0085\u202E]/);
    expect(refused.stdout).toBe('');
  });
});

describe('the committed JSON Schema', () => {
  it('equals a fresh generation from the zod schema', async () => {
    const committed = await readFile(new URL(planInputSchemaPath, root), 'utf8');
    expect(
      committed,
      `${planInputSchemaPath} no longer matches the zod plan schema: run \`npm run schema\` and commit the file`,
    ).toBe(planInputJsonSchemaText());
  });
});
