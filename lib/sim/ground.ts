/** The ground node's names, and the canonical name the topology rules use for it. */

/** True for the ground node's names ("gnd" in any case, and "0"). */
export function isGround(node: string): boolean {
  return node === "0" || node.toLowerCase() === "gnd";
}

/** Ground in the topology rules (kind.ts): a name no netlist node can have. */
export const GROUND = "\u0000ground";
