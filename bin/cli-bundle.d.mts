/** Types of bin/cli-bundle.mjs (plain JavaScript: it runs before any TypeScript loader). */
export declare const MANIFEST: string;
export type CliChoice = { kind: 'bundle'; entry: string } | { kind: 'tsx'; reason: string } | { kind: 'error'; message: string };
export declare function chooseCli(root: string, env: Record<string, string | undefined>): CliChoice;
export declare function bundleState(root: string, dir: string): { missing?: string; stale?: string };
