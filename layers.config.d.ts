/** Types of layers.config.js (see there). */
export declare const ENGINE_RANKS: readonly (readonly string[])[];
export declare const ENGINE_PACKAGES: readonly string[];
