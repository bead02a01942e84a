/** Public surface of the export module: trace check, CSV / JSON / CCSDS AEM writers, AEM reader. */
export { CAUTION_TEXT, QUATERNION_CONVENTION, FRAME_CONVENTION, TIME_CONVENTION } from '../caution';
export type { ExportMeta, ExportSegment } from './types';
export { validateTraceForExport } from './trace-check';
export type { TraceCheckOptions } from './trace-check';
export { traceColumns, selectSamples } from './columns';
export { exportSegments } from './segments';
export { writeCsv } from './csv';
export type { CsvOptions } from './csv';
export { writeJson, RUN_FORMAT, RUN_FORMAT_VERSION } from './json';
export type { JsonOptions } from './json';
export { writeAem, aemQuaternionFromAttitude } from './aem-write';
export type { AemOptions } from './aem-write';
export { parseAem } from './aem-read';
export type { AemDocument, AemSegment, AemDataLine } from './aem-read';
