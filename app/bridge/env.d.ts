import type { SlewsmithBridge } from './api';

declare global {
  /** Package version, replaced at build time by vite.config.ts `define`. */
  const __SLEWSMITH_VERSION__: string;
  interface Window {
    /** Present only in the desktop app, exposed by main/preload.ts. */
    readonly slewsmith?: SlewsmithBridge;
  }
}

export {};
