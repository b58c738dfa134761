/**
 * Chemical equilibrium of an ideal-gas mixture at fixed temperature and pressure by Gibbs
 * energy minimisation, in the Lagrange-multiplier (element potential) form of the NASA CEA
 * program: S. Gordon, B. J. McBride, "Computer Program for Calculation of Complex Chemical
 * Equilibrium Compositions and Applications", NASA RP-1311 (1994), §2.3 (iteration
 * equations 2.24–2.26 for a TP problem) and §3.3 (step-size control, eqs. 3.1–3.3; initial
 * estimate n_j = 0.1/NS).
 *
 * Unknowns are ln n_j, so every amount stays positive; the correction step is damped as in
 * CEA so that no major species grows by more than e² per iteration and a trace species
 * cannot jump above 1e-4 of the mixture in one step.
 */
import { GRI30_THERMO, gOverRT, NASA7_REFERENCE_PRESSURE_KPA } from '../thermo';

const ELEMENTS = ['C', 'H', 'O', 'N'] as const;
/** Elements balanced by the equilibrium solver. */
export type Element = (typeof ELEMENTS)[number];

/** Species considered in the full equilibrium (REFERENCES.md §6 / the list). */
export const EQUILIBRIUM_SPECIES = ['CO2', 'H2O', 'N2', 'O2', 'CO', 'H2', 'OH', 'H', 'O', 'NO', 'N'] as const;

/** A prepared equilibrium problem: element amounts and the participating species. */
export interface EquilibriumSystem {
  species: string[];
  elements: Element[];
  /** a[i][j] = atoms of element i in species j. */
  a: number[][];
  /** Target element amounts (kmol). */
  b0: number[];
  /** Inert gas amount (kmol) counted in the total moles but not reacting (e.g. SO2). */
  inertKmol: number;
}

/** Build a system for the given element amounts (kmol), keeping only species whose elements are present. */
export function buildSystem(elementKmol: Readonly<Record<Element, number>>, speciesList: readonly string[], inertKmol = 0): EquilibriumSystem {
  const elements = ELEMENTS.filter((e) => elementKmol[e] > 0);
  const species = speciesList.filter((s) => {
    const el = GRI30_THERMO[s]!.elements as Partial<Record<Element, number>>;
    return Object.keys(el).every((e) => elements.includes(e as Element));
  });
  const a = elements.map((e) => species.map((s) => (GRI30_THERMO[s]!.elements as Partial<Record<Element, number>>)[e] ?? 0));
  return { species, elements, a, b0: elements.map((e) => elementKmol[e]), inertKmol };
}

/** State carried between solves (warm start). */
export interface EquilibriumState {
  lnN: Float64Array;
  lnNTotal: number;
}

/** Result of {@link solveTP}. */
export interface TPResult {
  kmol: Float64Array;
  totalKmol: number;
  iterations: number;
  state: EquilibriumState;
}

const LN_TRACE = -18.420681; // ln(1e-8): CEA's threshold between major and trace species
const LN_TRACE_CAP = 9.2103404; // ln(1e4): a trace species may rise at most to 1e-4 of n

function solveLinear(m: number[][], rhs: number[]): number[] | undefined {
  const n = rhs.length;
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivot]![col]!)) pivot = r;
    if (Math.abs(m[pivot]![col]!) < 1e-300) return undefined;
    if (pivot !== col) {
      [m[col], m[pivot]] = [m[pivot]!, m[col]!];
      [rhs[col], rhs[pivot]] = [rhs[pivot]!, rhs[col]!];
    }
    const rowCol = m[col]!;
    for (let r = col + 1; r < n; r++) {
      const row = m[r]!;
      const f = row[col]! / rowCol[col]!;
      if (f === 0) continue;
      for (let k = col; k < n; k++) row[k] = row[k]! - f * rowCol[k]!;
      rhs[r] = rhs[r]! - f * rhs[col]!;
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = rhs[r]!;
    for (let k = r + 1; k < n; k++) s -= m[r]![k]! * x[k]!;
    x[r] = s / m[r]![r]!;
  }
  return x;
}

/**
 * Equilibrium amounts at `tempK` and `pressureKPa`. Returns undefined when it does not
 * converge in `maxIterations` (the caller turns that into an error a person can act on).
 */
export function solveTP(system: EquilibriumSystem, tempK: number, pressureKPa: number, warm?: EquilibriumState, maxIterations = 200): TPResult | undefined {
  const { species, a, b0, inertKmol } = system;
  const ns = species.length;
  const nl = b0.length;
  const g0 = new Float64Array(ns);
  for (let j = 0; j < ns; j++) g0[j] = gOverRT(species[j]!, tempK);
  const lnP = Math.log(pressureKPa / NASA7_REFERENCE_PRESSURE_KPA);
  const bScale = b0.reduce((s, v) => s + v, 0);

  const lnN = new Float64Array(ns);
  let lnNTotal: number;
  if (warm && warm.lnN.length === ns) {
    lnN.set(warm.lnN);
    lnNTotal = warm.lnNTotal;
  } else {
    const n0 = 0.1 * bScale;
    lnNTotal = Math.log(n0 + inertKmol);
    lnN.fill(Math.log(n0 / ns));
  }
  const nj = new Float64Array(ns);
  const mu = new Float64Array(ns);
  const dLnN = new Float64Array(ns);
  const size = nl + 1;

  for (let iter = 1; iter <= maxIterations; iter++) {
    const n = Math.exp(lnNTotal);
    let sumNj = 0;
    for (let j = 0; j < ns; j++) {
      nj[j] = Math.exp(lnN[j]!);
      sumNj += nj[j]!;
      mu[j] = g0[j]! + lnN[j]! - lnNTotal + lnP;
    }
    const m: number[][] = [];
    const rhs: number[] = [];
    for (let k = 0; k < nl; k++) {
      const row = new Array<number>(size).fill(0);
      let bk = 0;
      let rk = 0;
      for (let j = 0; j < ns; j++) {
        const akj = a[k]![j]!;
        if (akj === 0) continue;
        const w = akj * nj[j]!;
        bk += w;
        rk += w * mu[j]!;
        for (let i = 0; i < nl; i++) row[i] = row[i]! + w * a[i]![j]!;
      }
      row[nl] = bk;
      m.push(row);
      rhs.push(b0[k]! - bk + rk);
    }
    const last = new Array<number>(size).fill(0);
    let rLast = n - sumNj - inertKmol;
    for (let j = 0; j < ns; j++) {
      for (let i = 0; i < nl; i++) last[i] = last[i]! + a[i]![j]! * nj[j]!;
      rLast += nj[j]! * mu[j]!;
    }
    last[nl] = sumNj + inertKmol - n;
    m.push(last);
    rhs.push(rLast);
    const x = solveLinear(m, rhs);
    if (x === undefined) return undefined;
    const dLnNTotal = x[nl]!;

    let maxMajor = 5 * Math.abs(dLnNTotal);
    let lambda2 = 1;
    for (let j = 0; j < ns; j++) {
      let s = -mu[j]! + dLnNTotal;
      for (let i = 0; i < nl; i++) s += a[i]![j]! * x[i]!;
      dLnN[j] = s;
      const lnFrac = lnN[j]! - lnNTotal;
      if (lnFrac > LN_TRACE) {
        if (s > maxMajor) maxMajor = s;
      } else if (s >= 0 && s - dLnNTotal > 0) {
        const l2 = Math.abs((-lnFrac - LN_TRACE_CAP) / (s - dLnNTotal));
        if (l2 < lambda2) lambda2 = l2;
      }
    }
    const lambda1 = maxMajor > 0 ? 2 / maxMajor : 1;
    const lambda = Math.min(1, lambda1, lambda2);

    let converged = true;
    const total = sumNj + inertKmol;
    for (let j = 0; j < ns; j++) {
      lnN[j] = Math.max(lnN[j]! + lambda * dLnN[j]!, -700);
      if ((nj[j]! * Math.abs(dLnN[j]!)) / total > 0.5e-7) converged = false;
    }
    lnNTotal += lambda * dLnNTotal;
    if ((n * Math.abs(dLnNTotal)) / total > 0.5e-7) converged = false;
    if (converged && lambda === 1) {
      // element balance check
      let ok = true;
      for (let k = 0; k < nl; k++) {
        let bk = 0;
        for (let j = 0; j < ns; j++) bk += a[k]![j]! * Math.exp(lnN[j]!);
        if (Math.abs(bk - b0[k]!) > 1e-9 * bScale) ok = false;
      }
      if (ok) {
        const kmol = new Float64Array(ns);
        let totalKmol = inertKmol;
        for (let j = 0; j < ns; j++) {
          kmol[j] = Math.exp(lnN[j]!);
          totalKmol += kmol[j]!;
        }
        return { kmol, totalKmol, iterations: iter, state: { lnN: Float64Array.from(lnN), lnNTotal } };
      }
    }
  }
  return undefined;
}
