import type { Rule } from 'eslint';

export declare const tidewingPlugin: { rules: Record<string, Rule.RuleModule> };
