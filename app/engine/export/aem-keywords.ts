/**
 * CCSDS 504.0-B-2 (Attitude Data Messages, Blue Book Issue 2, January 2024), AEM in KVN form:
 * keyword tables in the standard's order, the attitude types and their data-line widths.
 * Sources: v2 Table 4-2 (header), Table 4-3 (metadata, order per §6.7.8), Table 4-4 (data types).
 */

export const AEM_VERSION = '2.0';

/** Header keywords in order (COMMENT only directly after CCSDS_AEM_VERS). M = mandatory. */
export const AEM_HEADER_KEYS = [
  { key: 'CCSDS_AEM_VERS', mandatory: true },
  { key: 'CLASSIFICATION', mandatory: false },
  { key: 'CREATION_DATE', mandatory: true },
  { key: 'ORIGINATOR', mandatory: true },
  { key: 'MESSAGE_ID', mandatory: false },
] as const;

/** Metadata keywords between META_START and META_STOP, in order (COMMENT first, optional). */
export const AEM_META_KEYS = [
  { key: 'OBJECT_NAME', mandatory: true },
  { key: 'OBJECT_ID', mandatory: true },
  { key: 'CENTER_NAME', mandatory: false },
  { key: 'REF_FRAME_A', mandatory: true },
  { key: 'REF_FRAME_B', mandatory: true },
  { key: 'TIME_SYSTEM', mandatory: true },
  { key: 'START_TIME', mandatory: true },
  { key: 'USEABLE_START_TIME', mandatory: false },
  { key: 'USEABLE_STOP_TIME', mandatory: false },
  { key: 'STOP_TIME', mandatory: true },
  { key: 'ATTITUDE_TYPE', mandatory: true },
  { key: 'EULER_ROT_SEQ', mandatory: false },
  { key: 'ANGVEL_FRAME', mandatory: false },
  { key: 'INTERPOLATION_METHOD', mandatory: false },
  { key: 'INTERPOLATION_DEGREE', mandatory: false },
] as const;

/** ATTITUDE_TYPE values of v2 and the number of values after the epoch on a data line. */
export const AEM_ATTITUDE_TYPES: Record<string, number> = {
  QUATERNION: 4,
  'QUATERNION/DERIVATIVE': 8,
  'QUATERNION/ANGVEL': 7,
  EULER_ANGLE: 3,
  'EULER_ANGLE/DERIVATIVE': 6,
  'EULER_ANGLE/ANGVEL': 6,
  SPIN: 4,
  'SPIN/NUTATION': 7,
  'SPIN/NUTATION_MOM': 7,
};

/** KVN line limit (v2 §6). */
export const KVN_MAX_LINE = 254;
