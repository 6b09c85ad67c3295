import type { Rule } from 'eslint';

export declare const importBoundaries: Rule.RuleModule;
