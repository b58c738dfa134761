/**
 * NASA 7-coefficient thermodynamic polynomials for the gas-phase species the flame
 * calculations need.
 *
 * Source: GRI-Mech 3.0 thermodynamic data file `thermo30.dat` (G. P. Smith, D. M. Golden,
 * M. Frenklach, N. W. Moriarty, B. Eiteneer, M. Goldenberg, C. T. Bowman, R. K. Hanson,
 * S. Song, W. C. Gardiner Jr., V. V. Lissianski, Z. Qin, "GRI-Mech 3.0",
 * http://combustion.berkeley.edu/gri-mech/), the same data carried by open-source
 * combustion libraries' GRI-Mech 3.0 input files. Every coefficient and temperature range
 * below was compared number by number with that data set as carried in Cantera's
 * `data/gri30.yaml` (ck2yaml conversion of gri30.inp + gri30_thermo.dat,
 * https://github.com/Cantera/cantera/blob/main/data/gri30.yaml) [pub]; the check found and
 * corrected one mistyped digit (CH4 high-range a1, 0.07485149 → 0.074851495).
 * `thermo.test.ts` compares the derived ΔHf°, cp° and S° at 298.15 K with published evaluated
 * values (NIST WebBook/CCCBDB, CODATA, ATcT) and checks that the low and high ranges meet at the
 * mid temperature.
 *
 * Form (REFERENCES.md §6): cp/R = a1 + a2T + a3T² + a4T³ + a5T⁴;
 * h/RT = a1 + a2T/2 + a3T²/3 + a4T³/4 + a5T⁴/5 + a6/T; s/R = a1 lnT + a2T + a3T²/2 + a4T³/3 + a5T⁴/4 + a7.
 * Reference pressure 1 atm (101.325 kPa).
 */

/** One species: element counts, molar mass and the two temperature ranges of its polynomial. */
export interface Nasa7Species {
  readonly name: string;
  readonly elements: Readonly<Partial<Record<'C' | 'H' | 'O' | 'N', number>>>;
  /** Molar mass, g/mol (IUPAC atomic weights). */
  readonly molarMassGPerMol: number;
  /** Valid range, K: [low, mid, high]. */
  readonly tempRangeK: readonly [number, number, number];
  /** a1…a7 for low ≤ T ≤ mid. */
  readonly low: readonly number[];
  /** a1…a7 for mid ≤ T ≤ high. */
  readonly high: readonly number[];
}

/** Reference pressure of the polynomials, kPa (1 atm, GRI-Mech 3.0 thermo30.dat). */
export const NASA7_REFERENCE_PRESSURE_KPA = 101.325;

/** GRI-Mech 3.0 species data used here, keyed by species name. */
export const GRI30_THERMO: Readonly<Record<string, Nasa7Species>> = {
  O: {
    name: 'O', elements: { O: 1 }, molarMassGPerMol: 15.999, tempRangeK: [200, 1000, 3500],
    low: [3.1682671, -3.27931884e-3, 6.64306396e-6, -6.12806624e-9, 2.11265971e-12, 2.91222592e4, 2.05193346],
    high: [2.56942078, -8.59741137e-5, 4.19484589e-8, -1.00177799e-11, 1.22833691e-15, 2.92175791e4, 4.78433864],
  },
  O2: {
    name: 'O2', elements: { O: 2 }, molarMassGPerMol: 31.998, tempRangeK: [200, 1000, 3500],
    low: [3.78245636, -2.99673416e-3, 9.84730201e-6, -9.68129509e-9, 3.24372837e-12, -1.06394356e3, 3.65767573],
    high: [3.28253784, 1.48308754e-3, -7.57966669e-7, 2.09470555e-10, -2.16717794e-14, -1.08845772e3, 5.45323129],
  },
  H: {
    name: 'H', elements: { H: 1 }, molarMassGPerMol: 1.008, tempRangeK: [200, 1000, 3500],
    low: [2.5, 7.05332819e-13, -1.99591964e-15, 2.30081632e-18, -9.27732332e-22, 2.54736599e4, -4.46682853e-1],
    high: [2.50000001, -2.30842973e-11, 1.61561948e-14, -4.73515235e-18, 4.98197357e-22, 2.54736599e4, -4.46682914e-1],
  },
  H2: {
    name: 'H2', elements: { H: 2 }, molarMassGPerMol: 2.016, tempRangeK: [200, 1000, 3500],
    low: [2.34433112, 7.98052075e-3, -1.9478151e-5, 2.01572094e-8, -7.37611761e-12, -9.17935173e2, 6.83010238e-1],
    high: [3.3372792, -4.94024731e-5, 4.99456778e-7, -1.79566394e-10, 2.00255376e-14, -9.50158922e2, -3.20502331],
  },
  OH: {
    name: 'OH', elements: { O: 1, H: 1 }, molarMassGPerMol: 17.007, tempRangeK: [200, 1000, 3500],
    low: [3.99201543, -2.40131752e-3, 4.61793841e-6, -3.88113333e-9, 1.3641147e-12, 3.61508056e3, -1.03925458e-1],
    high: [3.09288767, 5.48429716e-4, 1.26505228e-7, -8.79461556e-11, 1.17412376e-14, 3.858657e3, 4.4766961],
  },
  H2O: {
    name: 'H2O', elements: { H: 2, O: 1 }, molarMassGPerMol: 18.015, tempRangeK: [200, 1000, 3500],
    low: [4.19864056, -2.0364341e-3, 6.52040211e-6, -5.48797062e-9, 1.77197817e-12, -3.02937267e4, -8.49032208e-1],
    high: [3.03399249, 2.17691804e-3, -1.64072518e-7, -9.7041987e-11, 1.68200992e-14, -3.00042971e4, 4.9667701],
  },
  CO: {
    name: 'CO', elements: { C: 1, O: 1 }, molarMassGPerMol: 28.01, tempRangeK: [200, 1000, 3500],
    low: [3.57953347, -6.1035368e-4, 1.01681433e-6, 9.07005884e-10, -9.04424499e-13, -1.4344086e4, 3.50840928],
    high: [2.71518561, 2.06252743e-3, -9.98825771e-7, 2.30053008e-10, -2.03647716e-14, -1.41518724e4, 7.81868772],
  },
  CO2: {
    name: 'CO2', elements: { C: 1, O: 2 }, molarMassGPerMol: 44.009, tempRangeK: [200, 1000, 3500],
    low: [2.35677352, 8.98459677e-3, -7.12356269e-6, 2.45919022e-9, -1.43699548e-13, -4.83719697e4, 9.90105222],
    high: [3.85746029, 4.41437026e-3, -2.21481404e-6, 5.23490188e-10, -4.72084164e-14, -4.8759166e4, 2.27163806],
  },
  CH4: {
    name: 'CH4', elements: { C: 1, H: 4 }, molarMassGPerMol: 16.043, tempRangeK: [200, 1000, 3500],
    low: [5.14987613, -1.36709788e-2, 4.91800599e-5, -4.84743026e-8, 1.66693956e-11, -1.02466476e4, -4.64130376],
    high: [7.4851495e-2, 1.33909467e-2, -5.73285809e-6, 1.22292535e-9, -1.0181523e-13, -9.46834459e3, 1.8437318e1],
  },
  C2H6: {
    name: 'C2H6', elements: { C: 2, H: 6 }, molarMassGPerMol: 30.07, tempRangeK: [200, 1000, 3500],
    low: [4.29142492, -5.5015427e-3, 5.99438288e-5, -7.08466285e-8, 2.68685771e-11, -1.15222055e4, 2.66682316],
    high: [1.0718815, 2.16852677e-2, -1.00256067e-5, 2.21412001e-9, -1.9000289e-13, -1.14263932e4, 1.51156107e1],
  },
  C3H8: {
    name: 'C3H8', elements: { C: 3, H: 8 }, molarMassGPerMol: 44.097, tempRangeK: [300, 1000, 5000],
    low: [9.3355381e-1, 2.6424579e-2, 6.1059727e-6, -2.1977499e-8, 9.5149253e-12, -1.395852e4, 1.9201691e1],
    high: [7.5341368, 1.8872239e-2, -6.2718491e-6, 9.1475649e-10, -4.7838069e-14, -1.6467516e4, -1.7892349e1],
  },
  N: {
    name: 'N', elements: { N: 1 }, molarMassGPerMol: 14.007, tempRangeK: [200, 1000, 6000],
    low: [2.5, 0, 0, 0, 0, 5.6104637e4, 4.1939087],
    high: [2.4159429, 1.7489065e-4, -1.1902369e-7, 3.0226245e-11, -2.0360982e-15, 5.6133773e4, 4.6496096],
  },
  NO: {
    name: 'NO', elements: { N: 1, O: 1 }, molarMassGPerMol: 30.006, tempRangeK: [200, 1000, 6000],
    low: [4.2184763, -4.638976e-3, 1.1041022e-5, -9.3361354e-9, 2.803577e-12, 9.8446230e3, 2.2808464],
    high: [3.2606056, 1.1911043e-3, -4.2917048e-7, 6.9457669e-11, -4.0336099e-15, 9.9209746e3, 6.3693027],
  },
  N2: {
    name: 'N2', elements: { N: 2 }, molarMassGPerMol: 28.014, tempRangeK: [300, 1000, 5000],
    low: [3.298677, 1.4082404e-3, -3.963222e-6, 5.641515e-9, -2.444854e-12, -1.0208999e3, 3.950372],
    high: [2.92664, 1.4879768e-3, -5.68476e-7, 1.0097038e-10, -6.753351e-15, -9.227977e2, 5.980528],
  },
};
