// tidewing/pure-core: app/core runs the same in the desktop window, the browser, the command line
// and the tests, and gives the same answer for the same input. So it sees plain ECMAScript globals
// only (no `process`, `Buffer`, `window`, `document`, `console`, timers, `performance`, `crypto`
// or `globalThis`, which would reach all of them), and it never reads the clock or an unseeded
// random source itself: the caller passes the time and the random generator in as arguments
// (the model has its own seeded generator).
//
// The rule is enabled for app/core in eslint.config.js; it checks every file it is given.
import globals from 'globals';

const ruleName = 'tidewing/pure-core';

/**
 * Globals app/core may use: the ECMAScript built-ins of the language level the project compiles
 * to (tsconfig `lib: ES2023`), less `globalThis`, which is a door to every host global.
 */
const ecmaScriptGlobals = new Set(Object.keys(globals.es2023).filter((name) => name !== 'globalThis'));

/**
 * The variable a name resolves to from `scope`, or null when nothing in the file declares it
 * (a global, whether the language, the configuration or TypeScript's lib provides it).
 * @param {import('eslint').Scope.Scope} scope
 * @param {string} name
 */
function declaredVariable(scope, name) {
  for (let current = scope; current !== null; current = current.upper) {
    const variable = current.set.get(name);
    if (variable !== undefined && variable.defs.length > 0) return variable;
  }
  return null;
}

/** @type {import('eslint').Rule.RuleModule} */
export const pureCore = {
  meta: {
    type: 'problem',
    docs: {
      description: 'app/core uses plain ECMAScript globals only and never reads the clock or Math.random',
    },
    schema: [],
    messages: {
      hostGlobal: `${ruleName}: "{{name}}" belongs to a host (Node, a browser or globalThis), not to plain ECMAScript; app/core runs in every host, so pass what it needs in as an argument.`,
      clock: `${ruleName}: {{what}} reads the clock; app/core takes the time as an argument (a Date or epoch milliseconds from the caller).`,
      random: `${ruleName}: Math.random() is not reproducible; app/core takes a seeded generator as an argument (see the model's own generator).`,
    },
  },
  create(context) {
    const sourceCode = context.sourceCode;

    /** True when `node` (an Identifier) names the global of that name, not a local. */
    function isGlobal(node) {
      return declaredVariable(sourceCode.getScope(node), node.name) === null;
    }

    /** @param {import('estree').Node} node */
    function isGlobalNamed(node, name) {
      return node.type === 'Identifier' && node.name === name && isGlobal(node);
    }

    /** @param {import('estree').MemberExpression} node */
    function propertyName(node) {
      if (!node.computed && node.property.type === 'Identifier') return node.property.name;
      if (node.property.type === 'Literal' && typeof node.property.value === 'string')
        return node.property.value;
      return null;
    }

    return {
      'Program:exit'(program) {
        const reported = new Set();
        /** @param {import('eslint').Scope.Scope} scope */
        const visit = (scope) => {
          for (const reference of scope.references) {
            // Type positions (TypeScript) run nothing; lib types such as Record are fine there.
            if (/** @type {{ isValueReference?: boolean }} */ (reference).isValueReference === false)
              continue;
            const variable = reference.resolved;
            if (variable !== null && variable.defs.length > 0) continue;
            const identifier = reference.identifier;
            if (ecmaScriptGlobals.has(identifier.name) || reported.has(identifier)) continue;
            reported.add(identifier);
            context.report({ node: identifier, messageId: 'hostGlobal', data: { name: identifier.name } });
          }
          scope.childScopes.forEach(visit);
        };
        visit(sourceCode.getScope(program));
      },
      MemberExpression(node) {
        const property = propertyName(node);
        if (property === 'now' && isGlobalNamed(node.object, 'Date'))
          context.report({ node, messageId: 'clock', data: { what: 'Date.now()' } });
        if (property === 'random' && isGlobalNamed(node.object, 'Math'))
          context.report({ node, messageId: 'random' });
      },
      NewExpression(node) {
        if (node.arguments.length === 0 && isGlobalNamed(node.callee, 'Date'))
          context.report({ node, messageId: 'clock', data: { what: 'new Date() without an argument' } });
      },
      CallExpression(node) {
        // Date() called as a function ignores its arguments and returns the current time as text.
        if (isGlobalNamed(node.callee, 'Date'))
          context.report({ node, messageId: 'clock', data: { what: 'Date() called as a function' } });
      },
    };
  },
};
