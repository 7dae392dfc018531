/** Atom of every basis function, from the prepared shells (shell.atom, offset, nfunc). */
import type { PreparedShell } from "../integrals/shells.ts";

export function functionAtoms(shells: readonly PreparedShell[], nbf: number): Int32Array {
  const map = new Int32Array(nbf).fill(-1);
  for (const s of shells) for (let k = 0; k < s.nfunc; k++) map[s.offset + k] = s.atom;
  // every function must belong to a shell; a gap means the shells do not describe this basis
  const missing = map.indexOf(-1);
  if (missing >= 0) throw new Error(`basis function ${missing} belongs to no shell`);
  return map;
}
