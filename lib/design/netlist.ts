/**
 * The engine's netlist contract, as the templates emit it: the engine's own input types (lib/sim's zod schema), so a
 * misspelt model parameter or a missing field does not compile. The engine validates the netlist again when it runs.
 */
import type { Analysis, Netlist, NetlistElement, Wave } from "../sim";

export type { Wave };
export type NetlistElementJson = NetlistElement;
export type AnalysisJson = Analysis;
export type NetlistJson = Netlist;
