import { spawn } from 'node:child_process';
import { EventEmitter } from 'node:events';
import path from 'node:path';
import { needBuilt } from '../support/chromium.js';
import { describe, expect, it } from 'vitest';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import {
  endQuietlyOnClosedPipe,
  escapeForTerminal,
  jsonForTerminal,
  parseArguments,
  UsageError,
} from '../../main/cli/command-io.js';

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

describe('escapeForTerminal', () => {
  it('shows C0 and C1 controls, ESC sequences, bidi controls and lone surrogates as visible escapes', () => {
    // ECMA-48 (ISO 6429) C0 and C1 sets; Unicode UAX #9 explicit directional formatting characters.
    expect(escapeForTerminal('a\u001b[31mb')).toBe('a\\x1B[31mb');
    expect(escapeForTerminal('\u0000\u0007\b\r\n\t\u007f\u009b')).toBe(
      '\\x00\\x07\\x08\\x0D\\x0A\\x09\\x7F\\x9B',
    );
    expect(
      escapeForTerminal('\u202A\u202B\u202C\u202D\u202E\u2066\u2067\u2068\u2069\u200E\u200F\u061C'),
    ).toBe(
      '\\u{202A}\\u{202B}\\u{202C}\\u{202D}\\u{202E}\\u{2066}\\u{2067}\\u{2068}\\u{2069}\\u{200E}\\u{200F}\\u{061C}',
    );
    expect(escapeForTerminal('\u2028\u2029')).toBe('\\u{2028}\\u{2029}');
    expect(escapeForTerminal('x\uD800y\uDC00')).toBe('x\\u{D800}y\\u{DC00}');
  });

  it('leaves ordinary text alone: letters of any script, accents, emoji (surrogate pairs)', () => {
    const text = 'Kiwi, Perroquet gris du Gabon, Graupapagei, ヨウム, 🦜 (32 g)';
    expect(escapeForTerminal(text)).toBe(text);
  });

  it('keeps line breaks and tabs only when asked', () => {
    expect(escapeForTerminal('a\n\tb\r', { keepLineBreaks: true })).toBe('a\n\tb\\x0D');
  });
});

describe('parseArguments', () => {
  it('escapes an unknown option or argument it quotes back', () => {
    const spec = { valueOptions: ['--data'], maxPositionals: 0 };
    expect(() => parseArguments(['--x\u001b[2J'], spec)).toThrow(
      new UsageError('Unknown option "--x\\x1B[2J"; options: --data.'),
    );
    expect(() => parseArguments(['a\u202Eb'], spec)).toThrow(
      new UsageError('Unexpected argument "a\\u{202E}b".'),
    );
  });
});

describe('jsonForTerminal', () => {
  it('escapes what JSON.stringify leaves raw and still parses back to the same value', () => {
    const value = { name: 'Ki\u202Ewi\u0085\u2028', c0: '\u001b', lone: '\uD800' };
    const text = jsonForTerminal(value);
    expect(hasTerminalControls(text)).toBe(false);
    expect(JSON.parse(text)).toEqual(value);
  });
});

describe('endQuietlyOnClosedPipe', () => {
  it('swallows a closed pipe and reports any other output error', () => {
    const stream = new EventEmitter() as EventEmitter & Pick<NodeJS.WritableStream, 'on'>;
    const others: Error[] = [];
    endQuietlyOnClosedPipe([stream], (error) => others.push(error));
    stream.emit('error', Object.assign(new Error('write EPIPE'), { code: 'EPIPE' }));
    stream.emit('error', Object.assign(new Error('destroyed'), { code: 'ERR_STREAM_DESTROYED' }));
    expect(others).toEqual([]);
    const full = Object.assign(new Error('no space left on device'), { code: 'ENOSPC' });
    stream.emit('error', full);
    expect(others).toEqual([full]);
  });

  const entry = path.join(findProjectRoot(), 'build', 'main', 'cli', 'cli-entry.js');
  // Needs the compiled command (npm test builds first); in CI a missing build fails the test.
  it('`tidewing plan FILE | head -1` ends with exit 0 and no stack trace when the reader leaves', async (context) => {
    needBuilt(context, entry);
    const child = spawn(
      process.execPath,
      [entry, 'plan', path.join(findProjectRoot(), 'examples/plans/pip-budgerigar-mask-isoflurane.json')],
      { stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let stderr = '';
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString('utf8')));
    // Like head -1, but sure to be early: the reader leaves before the plan (about 80 KiB of
    // JSON, computed in about a second) is written, so every write meets a closed pipe.
    child.stdout.destroy();
    const code = await new Promise<number | null>((resolve) => child.once('close', resolve));
    expect(stderr).toBe('');
    expect(code).toBe(0);
  });
});
