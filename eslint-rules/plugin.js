// The project's own ESLint rules, registered as the `tidewing` plugin in eslint.config.js.
import { importBoundaries } from './import-boundaries.js';
import { pureCore } from './pure-core.js';

export const tidewingPlugin = { rules: { 'import-boundaries': importBoundaries, 'pure-core': pureCore } };
