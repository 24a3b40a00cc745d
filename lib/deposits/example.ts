/**
 * A complete example deposit, shown on /docs/deposit-format and used by the tests.
 *
 * Everything here is invented for illustration: the people, the title, the funder and every
 * number (generated from k = 2.2e-12 exp(−1750 K/T) cm³ molecule⁻¹ s⁻¹ with a few percent of
 * made-up scatter). Nothing is taken from any publication. The ORCID iD is the one ORCID's own
 * documentation uses for its fictitious researcher; 10.5555 is a DOI prefix reserved for tests.
 */
import type { DepositDocument } from "./types";
import { DEPOSIT_SCHEMA_ID } from "./vocabulary";

export const EXAMPLE_DEPOSIT: DepositDocument = {
  $schema: DEPOSIT_SCHEMA_ID,
  title: "OH + CH4 rate constants between 250 and 420 K (illustrative example)",
  description: [
    "Rate constants for **OH + CH₄ → H₂O + CH₃** measured under pseudo-first-order conditions with methane in large excess.",
    "",
    "- OH made by pulsed photolysis of a precursor, followed by laser-induced fluorescence",
    "- each value is the slope of the pseudo-first-order decay rate against [CH₄]",
    "",
    "This document is an *invented example* of the deposit format; the numbers are not measurements.",
  ].join("\n"),
  keywords: ["hydroxyl radical", "methane", "atmospheric oxidation"],
  license: "CC-BY-4.0",
  creators: [
    { name: "Okafor, Maren", orcid: "0000-0002-1825-0097", affiliation: "Example Institute of Physical Chemistry" },
    { name: "Lindqvist, Tomas", affiliation: "Example Institute of Physical Chemistry" },
  ],
  funding: [{ funder: "Example Science Foundation", awardId: "ESF-0000-01" }],
  reaction: {
    reactants: [
      { name: "hydroxyl radical", smiles: "[OH]", coefficient: 1 },
      { name: "methane", smiles: "C", inchi: "InChI=1S/CH4/h1H4", coefficient: 1 },
    ],
    products: [
      { name: "water", smiles: "O", coefficient: 1 },
      { name: "methyl radical", smiles: "[CH3]", coefficient: 1 },
    ],
    class: "hydrogen-abstraction",
    order: 2,
    phase: "gas",
  },
  method: {
    category: "experiment",
    technique: "pulsed laser photolysis",
    detection: "laser-induced fluorescence of OH",
    notes: "Second-order rate constants from the slopes of pseudo-first-order decay rates against [CH4].",
  },
  conditions: {
    pressure: { value: 50 },
    bathGas: "He",
  },
  units: { k: "cm3 molecule-1 s-1", T: "K", pressure: "Torr" },
  points: [
    { T: 250, k: 2.09e-15, uncertainty: { kind: "absolute", value: 1.7e-16, confidence: "2sigma" } },
    { T: 265, k: 2.89e-15, uncertainty: { kind: "absolute", value: 2.3e-16, confidence: "2sigma" } },
    { T: 280, k: 4.33e-15, uncertainty: { kind: "absolute", value: 3.5e-16, confidence: "2sigma" } },
    { T: 298, k: 5.89e-15, uncertainty: { kind: "absolute", value: 4.7e-16, confidence: "2sigma" } },
    { T: 315, k: 8.59e-15, uncertainty: { kind: "absolute", value: 6.9e-16, confidence: "2sigma" } },
    { T: 335, k: 1.22e-14, uncertainty: { kind: "relative", value: 8, confidence: "2sigma" } },
    { T: 355, k: 1.56e-14, uncertainty: { kind: "relative", value: 8, confidence: "2sigma" } },
    {
      T: 375,
      k: 2.17e-14,
      uncertainty: { kind: "relative", value: 8, confidence: "2sigma" },
      pressure: 100,
      note: "Measured at 100 Torr to check for pressure dependence.",
    },
    { T: 400, k: 2.74e-14, uncertainty: { kind: "factor", value: 1.1 } },
    { T: 420, k: 3.28e-14, uncertainty: { kind: "factor", value: 1.1 }, bathGas: "N2" },
  ],
  reportedFit: { model: "arrhenius", A: 2.2e-12, Ea: 14.55, EaUnit: "kJ mol-1", Tmin: 250, Tmax: 420, rangeUnit: "K" },
  source: {
    doi: "10.5555/arrhenia.example.0001",
    locator: "Table 1",
  },
  relatedIdentifiers: [{ kind: "url", identifier: "https://arrhenia.invalid/docs/deposit-format", relation: "described_by" }],
};
