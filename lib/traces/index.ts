/** Bench traces: parse scope exports, measure steps, compare with simulation. Pure; browser and server. */
export * from "./units";
export * from "./parse";
export * from "./compare";
