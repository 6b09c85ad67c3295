// Enforces the layer rules of the architecture (see DEVELOPERS.md):
//   app/core      imports nothing outside app/core (no packages, no Node built-ins)
//   app/contract  imports only app/core, app/contract and zod
//   app/ui        never imports main/ or db/, Node built-ins, better-sqlite3 or electron
//   db/           never imports app/ui or main/
//   electron      only from main/
import path from 'node:path';

const layers = ['app/core', 'app/contract', 'app/ui', 'main', 'db', 'test', 'eslint-rules', 'bin'];

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
    if (name === 'electron' && fromLayer !== 'main') return 'only main/ may import electron';
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
  if (fromLayer === 'app/ui' && (to === 'main' || to === 'db'))
    return 'app/ui talks to the back end only through app/contract';
  if (fromLayer === 'db' && (to === 'app/ui' || to === 'main')) return 'db/ never imports app/ui or main/';
  if (
    (fromLayer === 'app/core' ||
      fromLayer === 'app/contract' ||
      fromLayer === 'db' ||
      fromLayer === 'main') &&
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
    messages: { refused: 'Import of "{{source}}" is not allowed here: {{why}}.' },
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

export const tidewingPlugin = { rules: { 'import-boundaries': importBoundaries } };
