/** Texts that appear on every page, in one place. */
export const CAUTION =
  "Hartree–Fock and MP2 are approximations (Hartree–Fock has no electron correlation; MP2 is unreliable for multireference and strongly correlated systems); validate results before using them for decisions that matter, and defer to established practice.";

export const DATA_LICENCE = {
  name: "Creative Commons Attribution 4.0 International (CC BY 4.0)",
  short: "CC BY 4.0",
  url: "https://creativecommons.org/licenses/by/4.0/",
  text: "The demo archive's data (calculation specs, records, geometries and the numbers on these pages) are licensed under CC BY 4.0: you may share and adapt them with attribution. The fieldbook program itself is MIT-licensed.",
};

export const CONSTANTS_NOTE =
  "Units: hartree, bohr and ångström; CODATA 2018 constants (a0 = 0.529177210903 Å, Eh = 2625.4996394799 kJ/mol = 627.509474 kcal/mol with the thermochemical calorie, 4.184 J).";
