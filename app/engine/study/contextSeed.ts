/**
 * A study's context built once by the coordinator and handed to its workers.
 *
 * The costly part of `makeStudyContext` is the certificates of the synergistic laws (on SO(3) and
 * on the sphere: sampling, root finding, a completeness search; 0.1–1 s each). They are pure
 * functions of their parameters, cached per thread under a key of every number that enters
 * (control/certificate.ts, control/sphere/certificate.ts). The coordinator builds the context
 * once, takes the certificates it computed as plain data (structured-clone-able), and each worker
 * plants them in its own cache before building its context: the worker's build then finds every
 * certificate cached and does the cheap stages only (validate, resolve, plan). A worker given no
 * seed, or a seed for other parameters, computes what it misses as before, so the results do not
 * depend on the seed, only the time does.
 */
import type { CertificateResult } from '../control/certificate';
import { certificateCacheEntries, plantCertificateCache } from '../control/certificate';
import type { SphereCertificateResult } from '../control/sphere/certificate';
import { plantSphereCertificateCache, sphereCertificateCacheEntries } from '../control/sphere/certificate';
import type { StudyOverrides } from './context';
import { makeStudyContext } from './context';

export interface StudyContextSeed {
  /** Certificates on SO(3): [cache key, result]. */
  certificates: [string, CertificateResult][];
  /** Certificates of pointing families on the sphere: [cache key, result]. */
  sphereCertificates: [string, SphereCertificateResult][];
}

/**
 * Build the study's context on this thread (filling this thread's certificate caches) and return
 * the certificates as a seed for the workers. An invalid study gives an empty seed: the workers
 * then report the problems themselves, as without a seed.
 */
export function studyContextSeed(json: unknown, overrides: StudyOverrides = {}): StudyContextSeed {
  makeStudyContext(json, overrides);
  return { certificates: certificateCacheEntries(), sphereCertificates: sphereCertificateCacheEntries() };
}

/** Plant a seed from `studyContextSeed` in this thread's certificate caches. */
export function plantStudyContextSeed(seed: StudyContextSeed): void {
  plantCertificateCache(seed.certificates);
  plantSphereCertificateCache(seed.sphereCertificates);
}
