/**
 * Engine identity recorded with every result. `numerics` changes whenever a change can move a
 * published number (integral cut-offs, convergence defaults, basis data): records made with
 * another numerics version are recomputed, never silently reused.
 */
export const ENGINE_NAME = "fieldbook";
export const ENGINE_VERSION = "0.1.0";
export const NUMERICS_VERSION = 1;
