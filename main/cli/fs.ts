/**
 * Node's file system behind the atomic writer (temporary file in the same folder, fsync, rename):
 * a failed export never leaves a partial file nor destroys the previous one.
 */
import { open, rename, unlink, stat } from 'node:fs/promises';
import { writeFileAtomic, type AtomicFs, type WriteOutcome } from '../atomic-write';

const nodeAtomicFs: AtomicFs = {
  async open(filePath, flags, mode) {
    const h = await open(filePath, flags, mode);
    return {
      writeFile: (data) => h.writeFile(data),
      sync: () => h.sync(),
      close: () => h.close(),
    };
  },
  rename: (a, b) => rename(a, b),
  unlink: (p) => unlink(p),
  stat: async (p) => ({ mode: (await stat(p)).mode }),
};

export function writeFileAtomicNode(target: string, data: string | Uint8Array): Promise<WriteOutcome> {
  return writeFileAtomic(nodeAtomicFs, target, data);
}
