/**
 * Trade constants for the chemistry computations, each with its source.
 * Values are those listed in /work/shared/REFERENCES.md.
 */

/** The two base catalysts the app supports. */
export type Catalyst = 'KOH' | 'NaOH';

/** All catalysts, e.g. for a select. */
export const CATALYSTS: readonly Catalyst[] = ['KOH', 'NaOH'];

/** Molar mass of potassium hydroxide, g/mol. */
export const KOH_MOLAR_MASS_G_PER_MOL = 56.106; // IUPAC standard atomic weights (K 39.098 + O 15.999 + H 1.008)
/** Molar mass of sodium hydroxide, g/mol. */
export const NAOH_MOLAR_MASS_G_PER_MOL = 39.997; // IUPAC standard atomic weights (Na 22.990 + O 15.999 + H 1.008)
/** Molar mass of methanol, g/mol. */
export const METHANOL_MOLAR_MASS_G_PER_MOL = 32.04; // IUPAC standard atomic weights
/** Molar mass of glycerol, g/mol. */
export const GLYCEROL_MOLAR_MASS_G_PER_MOL = 92.09; // CRC Handbook of Chemistry and Physics
/** Molar mass of triolein, the model triglyceride for used cooking oil, g/mol. */
export const TRIOLEIN_MOLAR_MASS_G_PER_MOL = 885.4; // CRC Handbook (C57H104O6, IUPAC atomic weights)

/** Grams of KOH chemically equivalent to one gram of NaOH (≈ 1.4027). */
export const KOH_PER_NAOH = KOH_MOLAR_MASS_G_PER_MOL / NAOH_MOLAR_MASS_G_PER_MOL; // derived from IUPAC molar masses

/** Density of methanol at 20 °C, g/mL. */
export const METHANOL_DENSITY_G_PER_ML = 0.7915; // CRC Handbook of Chemistry and Physics
/** Boiling point of methanol at 1 atm, °C (148.5 °F). */
export const METHANOL_BOILING_POINT_C = 64.7; // CRC Handbook
/** Density of glycerol, g/mL. */
export const GLYCEROL_DENSITY_G_PER_ML = 1.261; // CRC Handbook
/** Typical density of used cooking oil, g/mL (measured range 0.904–0.923). */
export const OIL_DENSITY_G_PER_ML = 0.92; // published measurements of waste cooking oil properties
/** Density of B100 biodiesel, kg/L (7.3 lb/gal at 15.5 °C). */
export const B100_DENSITY_KG_PER_L = 0.88; // US DOE Alternative Fuels Data Center, Biodiesel Fuel Basics

/** Moles of methanol that react with one mole of triglyceride (1 TG + 3 MeOH → 3 FAME + 1 glycerol). */
export const METHANOL_PER_TRIGLYCERIDE_MOL = 3; // stoichiometry of transesterification
/** Moles of glycerol released per mole of triglyceride. */
export const GLYCEROL_PER_TRIGLYCERIDE_MOL = 1; // stoichiometry of transesterification

/**
 * Base catalyst amounts for fresh oil, grams of pure catalyst per litre of oil.
 * NaOH 3.5 g/L; KOH is the molar equivalent 3.5 × 1.4027 ≈ 4.91 g/L.
 */
export const DEFAULT_BASE_GRAMS_PER_LITER: Readonly<Record<Catalyst, number>> = {
  NaOH: 3.5, // common practice
  KOH: 3.5 * KOH_PER_NAOH, // common practice, converted with IUPAC molar masses (≈ 4.91)
};

/** Usual purity of commercial flake catalysts, % (KOH flake 85–92 %, NaOH 97–99 %). */
export const TYPICAL_PURITY_PCT: Readonly<Record<Catalyst, number>> = {
  KOH: 90, // common practice
  NaOH: 98, // common practice (97–99 %)
};
