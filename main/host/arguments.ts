export type StartArguments = {
  readonly port: number;
  readonly dataDirectory: string | null;
  readonly open: boolean;
  readonly forceBrowser: boolean;
  /** `--new-clinic`: start an empty clinic although `backups/` holds backups with records. */
  readonly newClinic: boolean;
  /** `--demo`: an empty clinic is filled with the invented demo clinic. */
  readonly demo: boolean;
};

export class ArgumentError extends Error {}

/**
 * Parses `npm start -- [--port N] [--data DIR] [--no-open] [--browser] [--new-clinic] [--demo]`.
 * `--port 0` (the default) takes any free port.
 */
export function parseStartArguments(argv: readonly string[], env: NodeJS.ProcessEnv = {}): StartArguments {
  let port = 0;
  let dataDirectory: string | null = null;
  let open = env['CI'] === undefined || env['CI'] === '' || env['CI'] === 'false';
  let forceBrowser = false;
  let newClinic = false;
  let demo = false;
  for (let index = 0; index < argv.length; index += 1) {
    const argument = argv[index];
    const next = () => {
      const value = argv[index + 1];
      if (value === undefined || value.startsWith('--'))
        throw new ArgumentError(`${argument} needs a value.`);
      index += 1;
      return value;
    };
    switch (argument) {
      case '--port': {
        const text = next();
        const value = Number(text);
        if (!Number.isInteger(value) || value < 0 || value > 65535)
          throw new ArgumentError(
            `--port must be a whole number from 0 to 65535 (0 = any free port); got "${text}".`,
          );
        port = value;
        break;
      }
      case '--data':
        dataDirectory = next();
        break;
      case '--no-open':
        open = false;
        break;
      case '--browser':
        forceBrowser = true;
        break;
      case '--new-clinic':
        newClinic = true;
        break;
      case '--demo':
        demo = true;
        break;
      default:
        throw new ArgumentError(
          `Unknown option "${String(argument)}". Options: --port N, --data DIR, --no-open, --browser, --new-clinic, --demo.`,
        );
    }
  }
  return { port, dataDirectory, open, forceBrowser, newClinic, demo };
}
