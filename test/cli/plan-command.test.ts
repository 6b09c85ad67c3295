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
    expect(stdout).toContain('Induction');
    expect(stdout).toContain('Recovery after off');
    expect(stdout).toContain('Air-sac wash-in 95 %');
    expect(() => JSON.parse(stdout)).toThrow();
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

describe('the committed JSON Schema', () => {
  it('equals a fresh generation from the zod schema', async () => {
    const committed = await readFile(new URL(planInputSchemaPath, root), 'utf8');
    expect(
      committed,
      `${planInputSchemaPath} no longer matches the zod plan schema: run \`npm run schema\` and commit the file`,
    ).toBe(planInputJsonSchemaText());
  });
});
