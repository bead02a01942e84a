import type { Issue } from '../errors';

/**
 * The element epoch's problems at the file's key (`epochUtc`), not the orbit library's input name
 * (orbitValidate.ts and pipeline/orbit.ts; here, apart from the schemas, so the pipeline does not
 * load them).
 */
export function atFileEpochKey(i: Issue): Issue {
  const from = 'orbit.meanElements.epochUtcIso';
  if (!i.path.startsWith(from)) return i;
  const to = 'orbit.meanElements.epochUtc';
  return { ...i, path: to + i.path.slice(from.length), message: i.message.split(from).join(to) };
}
