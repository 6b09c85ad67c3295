import type { Rule } from 'eslint';

export declare const pureCore: Rule.RuleModule;
