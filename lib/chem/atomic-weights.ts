/**
 * Element symbols and masses used for molar masses.
 *
 * Source: IUPAC/CIAAW standard atomic weights, abridged to five significant figures, with the
 * conventional single values for elements whose weight is given as an interval (H, Li, B, C, N,
 * O, Mg, Si, S, Cl, Br, Tl) — abridged, from memory; tests/unit/chem cross-checks every entry
 * against RDKit's own periodic table. Elements with no stable isotope carry the mass number of
 * their longest-lived isotope, as the IUPAC table shows it in brackets.
 */
const ELEMENTS: readonly (readonly [symbol: string, weight: number])[] = [
  ["H", 1.008],
  ["He", 4.0026],
  ["Li", 6.94],
  ["Be", 9.0122],
  ["B", 10.81],
  ["C", 12.011],
  ["N", 14.007],
  ["O", 15.999],
  ["F", 18.998],
  ["Ne", 20.18],
  ["Na", 22.99],
  ["Mg", 24.305],
  ["Al", 26.982],
  ["Si", 28.085],
  ["P", 30.974],
  ["S", 32.06],
  ["Cl", 35.45],
  ["Ar", 39.95],
  ["K", 39.098],
  ["Ca", 40.078],
  ["Sc", 44.956],
  ["Ti", 47.867],
  ["V", 50.942],
  ["Cr", 51.996],
  ["Mn", 54.938],
  ["Fe", 55.845],
  ["Co", 58.933],
  ["Ni", 58.693],
  ["Cu", 63.546],
  ["Zn", 65.38],
  ["Ga", 69.723],
  ["Ge", 72.63],
  ["As", 74.922],
  ["Se", 78.971],
  ["Br", 79.904],
  ["Kr", 83.798],
  ["Rb", 85.468],
  ["Sr", 87.62],
  ["Y", 88.906],
  ["Zr", 91.224],
  ["Nb", 92.906],
  ["Mo", 95.95],
  ["Tc", 97],
  ["Ru", 101.07],
  ["Rh", 102.91],
  ["Pd", 106.42],
  ["Ag", 107.87],
  ["Cd", 112.41],
  ["In", 114.82],
  ["Sn", 118.71],
  ["Sb", 121.76],
  ["Te", 127.6],
  ["I", 126.9],
  ["Xe", 131.29],
  ["Cs", 132.91],
  ["Ba", 137.33],
  ["La", 138.91],
  ["Ce", 140.12],
  ["Pr", 140.91],
  ["Nd", 144.24],
  ["Pm", 145],
  ["Sm", 150.36],
  ["Eu", 151.96],
  ["Gd", 157.25],
  ["Tb", 158.93],
  ["Dy", 162.5],
  ["Ho", 164.93],
  ["Er", 167.26],
  ["Tm", 168.93],
  ["Yb", 173.05],
  ["Lu", 174.97],
  ["Hf", 178.49],
  ["Ta", 180.95],
  ["W", 183.84],
  ["Re", 186.21],
  ["Os", 190.23],
  ["Ir", 192.22],
  ["Pt", 195.08],
  ["Au", 196.97],
  ["Hg", 200.59],
  ["Tl", 204.38],
  ["Pb", 207.2],
  ["Bi", 208.98],
  ["Po", 209],
  ["At", 210],
  ["Rn", 222],
  ["Fr", 223],
  ["Ra", 226],
  ["Ac", 227],
  ["Th", 232.04],
  ["Pa", 231.04],
  ["U", 238.03],
];

/** Highest atomic number with a mass in {@link STANDARD_ATOMIC_WEIGHTS} (uranium). */
export const MAX_ATOMIC_NUMBER = ELEMENTS.length;

/** Standard atomic weight of each element, g mol⁻¹, keyed by symbol (H … U). */
export const STANDARD_ATOMIC_WEIGHTS: Readonly<Record<string, number>> = Object.freeze(
  Object.fromEntries(ELEMENTS.map(([symbol, weight]) => [symbol, weight])),
);

/**
 * Masses of the nuclides that labelled species in rate studies commonly carry, g mol⁻¹,
 * keyed "<mass number><symbol>". Source: AME2020 atomic mass evaluation, rounded to six
 * decimals — from memory; tests cross-check them against RDKit's isotope masses.
 */
export const NUCLIDE_MASSES: Readonly<Record<string, number>> = Object.freeze({
  "1H": 1.007825,
  "2H": 2.014102,
  "3H": 3.016049,
  "12C": 12,
  "13C": 13.003355,
  "14C": 14.003242,
  "14N": 14.003074,
  "15N": 15.000109,
  "16O": 15.994915,
  "17O": 16.999132,
  "18O": 17.99916,
  "19F": 18.998403,
  "32S": 31.972071,
  "34S": 33.967867,
  "35Cl": 34.968853,
  "37Cl": 36.965903,
  "79Br": 78.918338,
  "81Br": 80.916291,
});

/** Symbol of the element with atomic number `z` (1 … 92), or undefined outside the table. */
export function getElementSymbol(z: number): string | undefined {
  return Number.isInteger(z) && z >= 1 ? ELEMENTS[z - 1]?.[0] : undefined;
}
