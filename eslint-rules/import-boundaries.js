// Enforces the layer rules of the architecture (see DEVELOPERS.md):
//   app/core      imports nothing outside app/core (no packages, no Node built-ins)
//   app/contract  imports only app/core, app/contract and zod
//   app/ui        never imports main/ or db/, Node built-ins, better-sqlite3 or electron
//   db/           never imports app/ui or main/
//   main/         is sorted by the runtime a file runs in:
//     main/electron   the Electron main process and preload: the only place that imports electron
//     main/host       `npm start` and the loopback host (plain Node)
//     main/cli        the command line and headless printing (plain Node)
//     main/back-end   handlers and dispatch, shared by every host (plain Node)
//   so main/host, main/cli and main/back-end never import main/electron.
import path from 'node:path';

const ruleName = 'tidewing/import-boundaries';

// The main/ runtimes come before main itself so that the longest folder wins.
const mainRuntimes = ['main/electron', 'main/host', 'main/cli', 'main/back-end'];
const layers = [
  'app/core',
  'app/contract',
  'app/ui',
  ...mainRuntimes,
  'main',
  'db',
  'test',
  'eslint-rules',
  'bin',
];

/** @param {string | null} layer */
function isMain(layer) {
  return layer === 'main' || (layer !== null && layer.startsWith('main/'));
}

/** @param {string} relativePath */
function layerOf(relativePath) {
  const normalised = relativePath.split(path.sep).join('/');
  return layers.find((layer) => normalised === layer || normalised.startsWith(`${layer}/`)) ?? null;
}

/** @param {string} source */
function packageName(source) {
  if (source.startsWith('node:')) return source;
  const parts = source.split('/');
  return source.startsWith('@') ? parts.slice(0, 2).join('/') : (parts[0] ?? source);
}

const nodeBuiltins = new Set([
  'assert',
  'buffer',
  'child_process',
  'crypto',
  'events',
  'fs',
  'fs/promises',
  'http',
  'https',
  'net',
  'os',
  'path',
  'process',
  'stream',
  'url',
  'util',
  'worker_threads',
  'zlib',
  'readline',
  'timers',
]);

/**
 * @param {string} fromLayer
 * @param {{ kind: 'local', layer: string | null } | { kind: 'package', name: string }} target
 * @returns {string | null} why the import is refused, or null when allowed
 */
function refusal(fromLayer, target) {
  if (target.kind === 'package') {
    const name = target.name;
    const isNode = name.startsWith('node:') || nodeBuiltins.has(name);
    if (name === 'electron' && fromLayer !== 'main/electron')
      return 'only main/electron/ may import electron (the host, command line and back end run in plain Node)';
    if (fromLayer === 'app/core')
      return 'app/core imports nothing outside itself (no packages, no Node built-ins)';
    if (fromLayer === 'app/contract' && name !== 'zod') return 'app/contract imports only app/core and zod';
    if (fromLayer === 'app/ui' && (isNode || name === 'better-sqlite3'))
      return 'app/ui runs in the renderer: no Node built-ins or database drivers';
    return null;
  }
  const to = target.layer;
  if (fromLayer === 'app/core' && to !== 'app/core') return 'app/core imports nothing outside itself';
  if (fromLayer === 'app/contract' && to !== 'app/core' && to !== 'app/contract')
    return 'app/contract imports only app/core and zod';
  if (fromLayer === 'app/ui' && (isMain(to) || to === 'db'))
    return 'app/ui talks to the back end only through app/contract';
  if (fromLayer === 'db' && (to === 'app/ui' || isMain(to))) return 'db/ never imports app/ui or main/';
  if (isMain(fromLayer) && fromLayer !== 'main/electron' && to === 'main/electron')
    return `${fromLayer}/ runs without Electron, so it never imports main/electron/`;
  if (
    (fromLayer === 'app/core' || fromLayer === 'app/contract' || fromLayer === 'db' || isMain(fromLayer)) &&
    to === 'test'
  )
    return 'product code never imports tests';
  return null;
}

/** @type {import('eslint').Rule.RuleModule} */
export const importBoundaries = {
  meta: {
    type: 'problem',
    docs: { description: 'Keep each layer to the imports the architecture allows' },
    schema: [{ type: 'object', properties: { root: { type: 'string' } }, additionalProperties: false }],
    messages: { refused: `${ruleName}: import of "{{source}}" is not allowed here: {{why}}.` },
  },
  create(context) {
    const options = context.options[0] ?? {};
    const root = options.root ?? context.cwd;
    const filename = context.filename;
    const fromLayer = layerOf(path.relative(root, filename));
    if (fromLayer === null) return {};

    /** @param {import('estree').Node} node @param {unknown} value */
    function check(node, value) {
      if (typeof value !== 'string') return;
      const target = value.startsWith('.')
        ? {
            kind: /** @type {const} */ ('local'),
            layer: layerOf(path.relative(root, path.resolve(path.dirname(filename), value))),
          }
        : { kind: /** @type {const} */ ('package'), name: packageName(value) };
      const why = refusal(/** @type {string} */ (fromLayer), target);
      if (why !== null) context.report({ node, messageId: 'refused', data: { source: value, why } });
    }

    return {
      ImportDeclaration(node) {
        check(node, node.source.value);
      },
      ExportNamedDeclaration(node) {
        if (node.source) check(node, node.source.value);
      },
      ExportAllDeclaration(node) {
        check(node, node.source.value);
      },
      ImportExpression(node) {
        if (node.source.type === 'Literal') check(node, node.source.value);
      },
      // `import x = require('...')`, as the CommonJS preload writes it in TypeScript.
      TSImportEqualsDeclaration(node) {
        const reference = node.moduleReference;
        if (reference.type === 'TSExternalModuleReference' && reference.expression.type === 'Literal')
          check(node, reference.expression.value);
      },
      CallExpression(node) {
        if (
          node.callee.type === 'Identifier' &&
          node.callee.name === 'require' &&
          node.arguments[0]?.type === 'Literal'
        ) {
          check(node, node.arguments[0].value);
        }
      },
    };
  },
};
