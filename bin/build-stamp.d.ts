export declare const sourceFolders: readonly string[];
export declare const sourceFiles: readonly string[];
export declare const requiredOutputs: readonly string[];
export declare const stampPath: string;
export declare function newestSource(root: string): { newestMs: number; newestFile: string | null };
export declare function readStamp(root: string): { sourcesNewestMs: number } | null;
export declare function buildDecision(facts: {
  stamp: { sourcesNewestMs: number } | null;
  newestMs: number;
  newestFile: string | null;
  missingOutputs: readonly string[];
}): { build: boolean; reason: string };
export declare function decideBuild(root: string): { build: boolean; reason: string };
export declare function beginBuild(root: string): void;
export declare function endBuild(root: string): void;
