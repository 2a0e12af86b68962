// Source names exactly as in shared/REFERENCES.md, used in test names so every check names its source.
export const SRC = {
  purdueHeatUnits:
    'Nielsen, "Heat Unit Concepts Related to Corn Development", Purdue Extension (rev. 2020) (read)',
  amsGlossary: 'American Meteorological Society, Glossary of Meteorology, "corn heat unit" (read)',
  iowaStateAgron541: "Iowa State University Agron 541, lesson 2b (read)",
  purdueLeafStage:
    'Nielsen, "Predict Leaf Stage Development in Corn Using Thermal Time", Purdue Extension, 2019 (read)',
  iowaStatePmr1009:
    'Abendroth et al., "Corn Growth and Development", PMR 1009, Iowa State University Extension, 2011 (quoted)',
  standRowLength:
    'University of Tennessee Extension crops blog (2011) table; NC State IPM "Evaluating Crop Stand" (read)',
  acreDefinition: "1 acre = 43,560 ft² (US customary definition)",
  kStateStarter:
    'Ruiz Diaz, "Starter fertilizer for corn: N placement and rate", K-State Agronomy eUpdate (read)',
  manitobaSbu: 'Manitoba Agriculture, "Guidelines for Safely Applying Fertilizer with Seed" (read)',
  vceDensity: 'Virginia Cooperative Extension, "Common Fertilizers Used in Virginia", SPES-199NP (read)',
  industrySheet: "industry physical-properties sheet (quoted)",
  rader1943: "Rader, White and Whittaker, Soil Science 55:201–218 (1943) (memory)",
  ucAnrIrrigation: 'University of California ANR, "Nitrogen in irrigation water" (read)',
  cdfaSoilNitrate: 'CDFA–FREP / UC Davis, "Field-specific N fertilization adjustments" (read)',
  cdfaGrain: "CDFA FREP Fertilization Guidelines, corn grain page (read)",
  cdfaSilage: "CDFA FREP Fertilization Guidelines, corn silage page (read)",
  purdueEmergence: 'Nielsen, "The Emergence Process in Corn", Purdue Extension (read)',
  iowaStateRoots: 'Iowa State "Corn Root Development" (read)',
  nist: "NIST (memory)",
  commonPractice: "common practice, no source",
  ourRule: "our rule, not a published figure",
  ourRubric: "our rubric (judgement), no source",
} as const;
