/**
 * The control module's public face: every law behind one interface (types.ts), built from typed
 * parameters (params.ts) through the law registry (registry.ts). The synergistic law is built only
 * when its family is certified and δ is admissible (certificate.ts), unless its parameters set
 * requireCertificate: false, in which case the refusal comes back as warnings (for demonstrations
 * of what goes wrong).
 */
export type { AttitudeController, ControlDiagnostics, ControlInput, DesignModel, LogicKind, PlantModel } from './types';
export { makeDiagnostics } from './types';
export type { ControllerCommon, ControllerParams, GainSetting, LawId, LawParams } from './params';
export type { GainMeaning, LawDefinition, LawField, ParamsOf } from './definition';
export { buildController, gainNoteOf, LAW_IDS, LAWS, lawDefinition } from './registry';
export { ControllerFileSchema, type ControllerFileEntry, type FileEntryOf } from './fileSchema';
export { gainsFromBandwidth, synergisticGainsFromBandwidth } from './gains';
export type { BandwidthGains, SynergisticBandwidthGains } from './gains';
export { certifySynergistic } from './certificate';
export type { CertificateResult, CertifyOptions, CertifyParams, CriticalPointReport } from './certificate';
export { flowSetGradientCheck } from './flowset';
export type { FlowSetCheck } from './flowset';
export { makeWarpFamily } from './potential';
export type { WarpFamily } from './potential';
export { eigenaxisLimits } from './laws/eigenaxis/law';
export { familyOf, potentialMatrix } from './laws/synergistic/definition';
