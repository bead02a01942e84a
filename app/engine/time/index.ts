/** Time scales, leap seconds and UTC epochs (see scales.ts for the conventions). */
export * from './calendar';
export * from './leapSeconds';
export * from './scales';
export * from './iso';
