/**
 * What the engine needs to know about one element kind, kept beside the element's class: its netlist schema, how to
 * build the element, and the rules the topology check applies (which terminal pairs carry DC, which fix a voltage).
 * registry.ts lists the kinds; the element schema, ELEMENT_KINDS, the compiler and the validator follow from it.
 */
import type { z } from "zod";
import type { Element } from "./circuit";

/** A terminal pair [p, q] (node names; GROUND from ground.ts for the ground node). */
export type NodePair = [string, string];

export interface KindRules<E> {
  /** Build the element from its parsed netlist entry. */
  create(e: E): Element;
  /** Terminal pairs the element joins with a DC path (the floating-node check). */
  dcPaths(e: E): NodePair[];
  /** Branches that fix a voltage at DC (a loop of them over-determines the loop's voltages). Default none. */
  voltageBranches?(e: E): NodePair[];
  /** Every node the element touches, control inputs included. Default: `nodes`. */
  terminals?(e: E): readonly string[];
  /** A message when the entry breaks a rule the schema cannot state (e.g. times out of order), else null. */
  check?(e: E): string | null;
  /** An independent source: a DC sweep may name it. */
  sweepable?: boolean;
}

export interface KindDef<K extends string, S extends z.ZodType> extends KindRules<z.output<S>> {
  readonly kind: K;
  readonly schema: S;
}

/** One kind: its name, the schema of its netlist entry (an object with `kind: z.literal(kind)`) and its rules. */
export function defineKind<K extends string, S extends z.ZodType<{ kind: K; name: string; nodes: readonly string[] }>>(
  kind: K, schema: S, rules: KindRules<z.output<S>>,
): KindDef<K, S> {
  return { kind, schema, ...rules };
}
