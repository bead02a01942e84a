// Types of bin/study-prestart.mjs (plain JavaScript, run before any TypeScript loader).
export declare const PRESTARTED: unique symbol;
export declare function studyWorkersAhead(argv: readonly string[], cores: number): number;
export declare function prestartStudyWorkers(argv: readonly string[], workerUrl: URL): void;
