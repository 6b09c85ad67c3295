/**
 * Writes docs/plan-input.schema.json from the zod plan schema, so the committed JSON Schema
 * always matches the validation the program applies. `npm run schema` runs this file.
 */
import fs from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { z } from 'zod';
import { planInputSchema } from '../../app/contract/plan.js';
import { findProjectRoot } from '../back-end/project-paths.js';

/** Relative path of the committed schema inside the repository. */
export const planInputSchemaPath = 'docs/plan-input.schema.json';

/** The JSON Schema text of a plan input (stable: same schema, same text). */
export function planInputJsonSchemaText(): string {
  const schema = z.toJSONSchema(planInputSchema, { io: 'input', unrepresentable: 'any' });
  const document = {
    $id: 'https://tidewing.invalid/plan-input.schema.json',
    title: 'Tidewing anaesthetic plan input',
    description:
      'Generated from planInputSchema (app/contract/plan.ts) by main/cli/write-json-schema.ts. Cross-field rules (schedule order, chamber volume for the chamber route, circle volume for a circle, ...) are checked by the program and are not all expressible here.',
    ...schema,
  };
  return `${JSON.stringify(document, null, 2)}\n`;
}

/**
 * Writes the schema file under `rootDirectory`.
 * @param rootDirectory repository root
 * @returns the path written
 */
export async function writePlanInputJsonSchema(rootDirectory: string): Promise<string> {
  const target = path.join(rootDirectory, planInputSchemaPath);
  await fs.mkdir(path.dirname(target), { recursive: true });
  await fs.writeFile(target, planInputJsonSchemaText(), 'utf8');
  return target;
}

// Run as a program (`npm run schema`), not when a test imports the module.
if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const written = await writePlanInputJsonSchema(findProjectRoot());
  process.stdout.write(`Wrote ${path.relative(process.cwd(), written)}\n`);
}
