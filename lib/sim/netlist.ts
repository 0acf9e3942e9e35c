/**
 * Netlist validation: the zod schema first (messages name the element and field), then topology rules that would
 * otherwise surface as a singular matrix: ground present, no voltage-source/inductor loop, every node with a DC path
 * to ground.
 */
import type { core } from "zod";
import { SimError } from "./errors";
import { ELEMENT_KINDS, netlistSchema, type ParsedNetlist } from "./schema";
import { GROUND, isGround } from "./ground";
import { rulesOf } from "./registry";

export { isGround };

function describeIssue(input: unknown, issue: core.$ZodIssue): string {
  const path = issue.path;
  const elements = (input as { elements?: unknown })?.elements;
  if (path[0] === "elements" && typeof path[1] === "number" && Array.isArray(elements)) {
    const el = elements[path[1]] as { name?: unknown; kind?: unknown } | undefined;
    const who = typeof el?.name === "string" ? `"${el.name}"` : "(unnamed)";
    const kind = typeof el?.kind === "string" ? ` (${el.kind})` : "";
    const field = path.slice(2).join(".");
    if (issue.code === "invalid_union" && field === "kind") {
      return `element ${path[1]} ${who}: unknown kind ${JSON.stringify(el?.kind)}; expected one of ${ELEMENT_KINDS.join(", ")}`;
    }
    if (issue.code === "unrecognized_keys") {
      return `element ${path[1]} ${who}${kind}: field "${field}" has unknown key(s) ${issue.keys.map((k) => `"${k}"`).join(", ")}`;
    }
    return `element ${path[1]} ${who}${kind}: field "${field || "(element)"}" ${issue.message}`;
  }
  return `field "${path.join(".") || "(netlist)"}" ${issue.message}`;
}

/** Validate a netlist (schema + topology). Throws SimError "invalid" naming the element and field, or the node. */
export function parseNetlist(input: unknown): ParsedNetlist {
  const r = netlistSchema.safeParse(input);
  if (!r.success) {
    const msgs = r.error.issues.slice(0, 5).map((i) => describeIssue(input, i));
    const more = r.error.issues.length > 5 ? ` (and ${r.error.issues.length - 5} more)` : "";
    throw new SimError("invalid", `Invalid netlist: ${msgs.join("; ")}${more}`);
  }
  checkTopology(r.data);
  return r.data;
}

/** Union-find over node names. */
class Sets {
  private parent = new Map<string, string>();
  find(a: string): string {
    let p = this.parent.get(a) ?? a;
    if (p === a) return a;
    p = this.find(p);
    this.parent.set(a, p);
    return p;
  }
  union(a: string, b: string): boolean {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return false;
    this.parent.set(ra, rb);
    return true;
  }
}

const canon = (n: string) => (isGround(n) ? GROUND : n);

function checkTopology(n: ParsedNetlist): void {
  const names = new Set<string>();
  let hasGround = false;
  const nodeUsers = new Map<string, string[]>();
  for (const el of n.elements) {
    if (names.has(el.name)) throw new SimError("invalid", `Invalid netlist: element name "${el.name}" is used twice`);
    names.add(el.name);
    const rules = rulesOf(el);
    const all = rules.terminals ? rules.terminals(el) : el.nodes;
    for (const nd of all) {
      if (isGround(nd)) { hasGround = true; continue; }
      const u = nodeUsers.get(nd) ?? [];
      u.push(el.name);
      nodeUsers.set(nd, u);
    }
    const broken = rules.check?.(el) ?? null;
    if (broken !== null) throw new SimError("invalid", `Invalid netlist: element "${el.name}" (${el.kind}): ${broken}`);
  }
  if (!hasGround) {
    throw new SimError("invalid", `Invalid netlist: no element connects to ground (node "gnd" or "0")`);
  }
  const a = n.analysis;
  if (a.kind === "dcsweep") {
    const src = n.elements.find((e) => e.name === a.source);
    if (!src || !rulesOf(src).sweepable) {
      throw new SimError("invalid", `Invalid netlist: field "analysis.source" names "${a.source}", which is not a vsource or isource in the netlist`);
    }
  }
  if ((a.kind === "ac" || a.kind === "noise") && a.fStop < a.fStart) {
    throw new SimError("invalid", `Invalid netlist: field "analysis.fStop" (${a.fStop}) must be ≥ analysis.fStart (${a.fStart})`);
  }
  // Voltage-source / inductor loops (Kirchhoff's voltage law would over-determine the loop).
  const vs = new Sets();
  for (const el of n.elements) {
    for (const [p, q] of rulesOf(el).voltageBranches?.(el) ?? []) {
      if (canon(p) === canon(q) || !vs.union(canon(p), canon(q))) {
        throw new SimError(
          "invalid",
          `Invalid netlist: element "${el.name}" (${el.kind}) closes a loop of voltage sources/inductors` +
            ` between nodes "${p}" and "${q}" (the loop's voltages are over-determined; add a series resistance)`,
        );
      }
    }
  }
  // Floating nodes: every node needs a DC path to ground.
  const dc = new Sets();
  for (const el of n.elements) for (const [p, q] of rulesOf(el).dcPaths(el)) dc.union(canon(p), canon(q));
  const groundRoot = dc.find(GROUND);
  for (const [nd, users] of nodeUsers) {
    if (dc.find(nd) !== groundRoot) {
      throw new SimError(
        "invalid",
        `Invalid netlist: node "${nd}" is floating: no DC path to ground (connected to ${users.map((u) => `"${u}"`).join(", ")})`,
      );
    }
  }
}
