import { describe, expect, it } from 'vitest';
import { parseStartArguments } from '../../main/host/arguments.js';
import { defaultDataDirectory } from '../../main/back-end/data-directory.js';

describe('start arguments', () => {
  it('defaults to any free port, the platform data folder and opening the browser', () => {
    expect(parseStartArguments([], {})).toEqual({
      port: 0,
      dataDirectory: null,
      open: true,
      forceBrowser: false,
      newClinic: false,
      demo: false,
      database: null,
    });
  });

  it('reads --port, --data, --no-open, --browser, --new-clinic and --demo', () => {
    expect(
      parseStartArguments(
        ['--port', '8123', '--data', '/tmp/x', '--no-open', '--browser', '--new-clinic', '--demo'],
        {},
      ),
    ).toEqual({
      port: 8123,
      dataDirectory: '/tmp/x',
      open: false,
      forceBrowser: true,
      newClinic: true,
      demo: true,
      database: null,
    });
  });

  it('reads --database and TIDEWING_DATABASE_URL, the option winning', () => {
    const option = ['--database', 'postgresql://tidewing@clinic-server:5432/heron_lane'];
    expect(parseStartArguments(option, {}).database).toEqual({
      url: 'postgresql://tidewing@clinic-server:5432/heron_lane',
      source: 'command line',
    });
    const env = { TIDEWING_DATABASE_URL: ' postgres://reader@10.0.0.5/clinic ' };
    expect(parseStartArguments([], env).database).toEqual({
      url: 'postgres://reader@10.0.0.5/clinic',
      source: 'environment',
    });
    expect(parseStartArguments(option, env).database?.source).toBe('command line');
    expect(parseStartArguments([], { TIDEWING_DATABASE_URL: '' }).database).toBeNull();
    expect(() => parseStartArguments(['--database', '/srv/tidewing.db'], {})).toThrow(
      /--database takes a PostgreSQL address, postgresql:\/\/user@host:5432\/database; got "\/srv\/tidewing.db"/,
    );
  });

  it('does not open a browser when CI is set', () => {
    expect(parseStartArguments([], { CI: 'true' }).open).toBe(false);
  });

  it.each([[['--port', '70000']], [['--port', 'abc']], [['--data']], [['--verbose']]])(
    'rejects %j with a message',
    (argv) => {
      expect(() => parseStartArguments(argv, {})).toThrow(/--port|--data|Unknown option/);
    },
  );
});

describe('default data folder', () => {
  it('follows each platform’s per-user data convention', () => {
    expect(defaultDataDirectory('linux', {}, '/home/vet')).toBe('/home/vet/.local/share/tidewing');
    expect(defaultDataDirectory('linux', { XDG_DATA_HOME: '/data/xdg' }, '/home/vet')).toBe(
      '/data/xdg/tidewing',
    );
    expect(defaultDataDirectory('darwin', {}, '/Users/vet')).toBe(
      '/Users/vet/Library/Application Support/Tidewing',
    );
    expect(
      defaultDataDirectory('win32', { APPDATA: 'C:\\Users\\vet\\AppData\\Roaming' }, 'C:\\Users\\vet'),
    ).toBe('C:\\Users\\vet\\AppData\\Roaming\\Tidewing');
  });
});
