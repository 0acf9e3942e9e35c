/**
 * The element registry: every kind the engine knows, each defined beside its element (kind.ts). A new device adds
 * its element file (class, schema, rules) and one line here; the element schema, ELEMENT_KINDS, the compiler and the
 * topology check follow.
 */
import { z } from "zod";
import type { KindRules } from "./kind";
import { capacitorKind, inductorKind, isourceKind, resistorKind, switchKind, vccsKind, vcvsKind, vsourceKind } from "./elements/linear-kinds";
import { diodeKind } from "./elements/diode";
import { bjtKind } from "./elements/bjt";
import { mosfetKind } from "./elements/mosfet";
import { opampKind } from "./elements/opamp";

const KINDS = [
  resistorKind, capacitorKind, inductorKind, vsourceKind, isourceKind, vcvsKind, vccsKind, switchKind,
  diodeKind, bjtKind, mosfetKind, opampKind,
] as const;
type Kinds = typeof KINDS;
type NamesOf<T extends readonly unknown[]> = { readonly [I in keyof T]: T[I] extends { kind: infer K } ? K : never };
type SchemasOf<T extends readonly unknown[]> = { -readonly [I in keyof T]: T[I] extends { schema: infer S } ? S : never };

/** Kinds the engine knows, in registry order (derived from the registry). */
export const ELEMENT_KINDS = KINDS.map((k) => k.kind) as unknown as NamesOf<Kinds>;

/** One netlist element: the union of every kind's schema, told apart by `kind`. */
export const elementSchema = z.discriminatedUnion(
  "kind",
  KINDS.map((k) => k.schema) as unknown as SchemasOf<Kinds>,
);

export type ParsedElement = z.output<typeof elementSchema>;

const byKind = new Map<string, KindRules<ParsedElement>>(KINDS.map((k) => [k.kind, k as unknown as KindRules<ParsedElement>]));

/** The rules of a parsed element's kind. */
export function rulesOf(e: ParsedElement): KindRules<ParsedElement> {
  const r = byKind.get(e.kind);
  if (!r) throw new Error(`no registry entry for kind "${e.kind}"`); // cannot happen after parsing
  return r;
}
