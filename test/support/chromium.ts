import fs from 'node:fs';

/**
 * Chromium for the tests and benchmarks that print or drive a page: Debian's /usr/bin/chromium
 * (never a downloaded browser), or the one CHROMIUM_PATH names.
 *
 * A test that needs Chromium must not pass quietly on a machine without it: under CI (the `CI`
 * variable set) a missing Chromium fails the test with a message that says how to install it;
 * on a developer's machine the test is skipped with the same message.
 */

type Environment = Readonly<Record<string, string | undefined>>;

/** Where Chromium is looked for: CHROMIUM_PATH, else Debian's package. */
export function chromiumPath(env: Environment = process.env): string {
  const configured = env['CHROMIUM_PATH'];
  return configured === undefined || configured === '' ? '/usr/bin/chromium' : configured;
}

/** True when `CI` is set to anything but an empty string, `0` or `false`. */
export function runningUnderCi(env: Environment = process.env): boolean {
  const value = env['CI'];
  return value !== undefined && value !== '' && value !== '0' && value.toLowerCase() !== 'false';
}

/** What a test says when Chromium is missing. */
export function chromiumMissingMessage(executablePath: string): string {
  return `Chromium not found at ${executablePath}; apt-get install chromium or set CHROMIUM_PATH`;
}

/** The message when Chromium is missing, or null when the executable is there. */
export function missingChromium(env: Environment = process.env): string | null {
  const executablePath = chromiumPath(env);
  return fs.existsSync(executablePath) ? null : chromiumMissingMessage(executablePath);
}

/** Thrown under CI when a test or benchmark needs Chromium and it is missing. */
export class ChromiumMissingError extends Error {
  override name = 'ChromiumMissingError';
}

/**
 * Chromium's path for code that cannot skip (a suite's setup, a benchmark). Missing under CI:
 * throws {@link ChromiumMissingError}. Missing elsewhere: returns the message instead of a path.
 */
export function chromiumOrReason(
  env: Environment = process.env,
): { readonly executablePath: string } | { readonly missing: string } {
  const missing = missingChromium(env);
  if (missing === null) return { executablePath: chromiumPath(env) };
  if (runningUnderCi(env)) throw new ChromiumMissingError(missing);
  return { missing };
}

/**
 * At the start of a test that needs Chromium (or in its `beforeEach`): returns Chromium's path.
 * Missing under CI: the test fails with the message. Missing elsewhere: it is skipped with it.
 * @param context the test's context (vitest's `skip(note)`), so the skip carries the message
 */
export function needChromium(
  context: { skip: (note?: string) => never },
  env: Environment = process.env,
): string {
  const found = chromiumOrReason(env);
  if ('executablePath' in found) return found.executablePath;
  return context.skip(found.missing);
}

/**
 * For a test that needs a file the build writes (`npm run build`): missing under CI fails the
 * test, missing elsewhere skips it, both saying which file and what to run.
 * @param file absolute path of the built file
 */
export function needBuilt(
  context: { skip: (note?: string) => never },
  file: string,
  env: Environment = process.env,
): void {
  if (fs.existsSync(file)) return;
  const message = `${file} is not built; run npm run build first`;
  if (runningUnderCi(env)) throw new Error(message);
  context.skip(message);
}
