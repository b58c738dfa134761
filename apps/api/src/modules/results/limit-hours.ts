/**
 * A limit's hourly values: the stack's hourly channel values → the limit's unit, basis and
 * reference O2 with the compliance engine's `deriveHourlyValues` (dry basis, standard conditions,
 * O2 correction with the same hour's O2, mass rate). This file picks the input channels of a limit
 * and states the result in the limit's unit with the calc package's conversions; it computes no
 * average and no verdict of its own.
 */
import {
  CUBIC_FOOT_M3,
  CalcInputError,
  type DeriveInputs,
  type DeriveOptions,
  HOUR_REASONS,
  HOUR_STATUSES,
  HourStatusCode,
  type HourlySeries,
  NORMAL_TEMP_K,
  SPECIES,
  type Species,
  deriveHourlyValues,
  dryToWet,
  gPerGJToLbPerMMBtu,
  mgPerNm3AtReferenceO2ToGPerGJ,
  mgPerNm3ToPpm,
  US_STANDARD_TEMP_K,
  scfPerMMBtuToNm3PerGJ,
  stoichiometry,
} from '@flueledger/calc';
import type { LimitRow } from '../permits/limits.repo';
import { type DbHourStatus, toDbHourStatus, toDbWord } from './channel-hours';
import type { ChannelInfo, FuelInfo, StackContext } from './stack-context';

/** The channels a limit's hourly values are derived from. */
export interface LimitInputs {
  pollutant: ChannelInfo;
  o2?: ChannelInfo;
  moisture?: ChannelInfo;
  flow?: ChannelInfo;
  temperature?: ChannelInfo;
  pressure?: ChannelInfo;
  fuelFlow?: ChannelInfo;
}

export type LimitPlan =
  | { ok: true; inputs: LimitInputs; channelIds: string[]; usesFuel: boolean }
  | { ok: false; problem: string };

/** Ambient O2 of the Method 19 F-factor relation (40 CFR 60 App. A Method 19 eq. 19-1). */
const METHOD19_AMBIENT_O2_PERCENT = 20.9;

function pick(channels: readonly ChannelInfo[], parameter: ChannelInfo['parameter'], accept: (c: ChannelInfo) => boolean = () => true): ChannelInfo | undefined {
  const matching = channels.filter((c) => c.parameter === parameter && accept(c));
  // A dry-basis channel needs no moisture to be compared with a dry-basis limit.
  return matching.find((c) => c.basis === 'dry') ?? matching[0];
}

const isSpecies = (p: string): p is Species => (SPECIES as readonly string[]).includes(p);

/** Which channels feed a limit, or why it has no hourly values. */
export function planLimit(ctx: Pick<StackContext, 'channels' | 'fuel'>, limit: Pick<LimitRow, 'pollutant' | 'unit'>): LimitPlan {
  if (limit.unit === 't/yr') {
    return { ok: false, problem: 'An annual mass limit (t/yr) is checked against the annual total, not hourly values.' };
  }
  const pollutant = pick(ctx.channels, limit.pollutant as ChannelInfo['parameter'], (c) => ['mg/Nm3', 'ug/Nm3', 'ppm'].includes(c.unit));
  if (!pollutant) return { ok: false, problem: `No ${limit.pollutant} channel (mg/Nm3, ug/Nm3 or ppm) on this stack.` };
  if (pollutant.unit === 'ppm' && !isSpecies(limit.pollutant)) {
    return { ok: false, problem: `${limit.pollutant} in ppm cannot be converted to a mass concentration.` };
  }
  if (limit.unit === 'ppm' && !isSpecies(limit.pollutant)) {
    return { ok: false, problem: `${limit.pollutant} has no molar mass to state it in ppm.` };
  }
  const inputs: LimitInputs = {
    pollutant,
    o2: pick(ctx.channels, 'O2', (c) => c.unit === '%'),
    moisture: pick(ctx.channels, 'H2O', (c) => c.unit === '%'),
    // Only flows at standard conditions: an actual flow would need its own T and p.
    flow: pick(ctx.channels, 'flow', (c) => c.unit === 'Nm3/h' || c.unit === 'scfh'),
    temperature: pick(ctx.channels, 'temperature', (c) => c.unit === 'degC' || c.unit === 'degF' || c.unit === 'K'),
    pressure: pick(ctx.channels, 'pressure', (c) => c.unit === 'kPa' || c.unit === 'hPa'),
    fuelFlow: pick(ctx.channels, 'fuel_flow', (c) => c.unit === 'kg/h' || c.unit === 't/h'),
  };
  const usesFuel = limit.unit === 'lb/MMBtu' || limit.unit === 'ng/J' || (limit.unit === 'kg/h' && !inputs.flow && !!inputs.fuelFlow);
  const channelIds = Object.values(inputs).filter((c): c is ChannelInfo => !!c).map((c) => c.id);
  return { ok: true, inputs, channelIds: [...new Set(channelIds)], usesFuel };
}

/** One stored row of `limit_hourly_values`. */
export interface LimitHourRow {
  hourStart: number;
  /** In the limit's unit, basis and reference O2; null when the hour has no usable value. */
  value: number | null;
  status: DbHourStatus;
  reason: string | null;
  o2PercentDry: number | null;
  coverage: number | null;
  dryMgPerNm3: number | null;
  massKgPerHour: number | null;
  channelId: string;
}

type LimitFields = Pick<LimitRow, 'pollutant' | 'unit' | 'basis' | 'reference_o2_percent' | 'ambient_o2_percent' | 'correct_only_when_above'>;

function scaled(s: HourlySeries, factor: number, offset = 0): HourlySeries {
  if (factor === 1 && offset === 0) return s;
  const value = new Float64Array(s.value.length);
  for (let i = 0; i < value.length; i++) value[i] = s.value[i]! * factor + offset;
  return { ...s, value };
}

const num = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * Normal cubic metres (0 °C, 101.325 kPa) in one standard cubic foot (68 °F = 293.15 K,
 * 29.92 in Hg = 101.325 kPa; 40 CFR 60.2): the cubic foot (0.3048³ m3, exact) brought from 20 °C
 * to 0 °C at the same pressure (ideal gas). [derived] 0.02638.
 */
export const NM3_PER_SCF = (CUBIC_FOOT_M3 * NORMAL_TEMP_K) / US_STANDARD_TEMP_K;

function toKelvin(s: HourlySeries, unit: string): HourlySeries {
  if (unit === 'degC') return scaled(s, 1, NORMAL_TEMP_K);
  // °F → K: (°F − 32) × 5/9 + 273.15 (definition of the Fahrenheit scale).
  if (unit === 'degF') return scaled(s, 5 / 9, NORMAL_TEMP_K - (32 * 5) / 9);
  return s;
}

/**
 * Derives the limit's hourly values from the stack's hourly channel series (keyed by channel id).
 * One row per hour of the pollutant channel. Hours that cannot be stated in the limit's terms
 * (no usable O2 for an O2-referenced limit, no moisture for a wet channel, no flow for a mass
 * limit …) are `invalid` with the engine's reason.
 */
export function deriveLimitHours(
  limit: LimitFields,
  plan: Extract<LimitPlan, { ok: true }>,
  series: ReadonlyMap<string, HourlySeries>,
  fuel: FuelInfo | null,
): LimitHourRow[] {
  const { inputs } = plan;
  const pollutantSeries = series.get(inputs.pollutant.id);
  if (!pollutantSeries || pollutantSeries.t.length === 0) return [];
  const at = (c: ChannelInfo | undefined) => (c ? series.get(c.id) : undefined);
  const referenceO2 = limit.reference_o2_percent === null ? null : Number(limit.reference_o2_percent);
  const ambient = Number(limit.ambient_o2_percent) === 20.9 ? 20.9 : 21;
  const concentrationLimit = ['mg/Nm3', 'ug/Nm3', 'ppm'].includes(limit.unit);
  const heatInputLimit = limit.unit === 'lb/MMBtu' || limit.unit === 'ng/J';

  const derivedInputs: DeriveInputs = {
    // µg/Nm3 channels are brought to mg/Nm3 (÷ 1000) so the engine sees one mass unit.
    pollutant: scaled(pollutantSeries, inputs.pollutant.unit === 'ug/Nm3' ? 1e-3 : 1),
    ...(at(inputs.o2) ? { o2: at(inputs.o2) } : {}),
    ...(at(inputs.moisture) ? { moisture: at(inputs.moisture) } : {}),
    // °C → K (+273.15), °F → K (× 5/9, + 255.372…) and hPa → kPa (÷ 10): unit definitions.
    ...(at(inputs.temperature) ? { temperatureK: toKelvin(at(inputs.temperature)!, inputs.temperature!.unit) } : {}),
    ...(at(inputs.pressure) ? { pressureKPa: scaled(at(inputs.pressure)!, inputs.pressure!.unit === 'hPa' ? 0.1 : 1) } : {}),
    ...(at(inputs.flow) ? { flowNm3PerHour: scaled(at(inputs.flow)!, inputs.flow!.unit === 'scfh' ? NM3_PER_SCF : 1) } : {}),
  };
  let dryFlueGasNm3PerKgFuelStoich: number | undefined;
  if (!derivedInputs.flowNm3PerHour && at(inputs.fuelFlow) && fuel?.fuel) {
    try {
      const st = stoichiometry(fuel.fuel);
      dryFlueGasNm3PerKgFuelStoich = st.flueGasDryNm3 / st.fuelMassKg;
      Object.assign(derivedInputs, { fuelKgPerHour: scaled(at(inputs.fuelFlow)!, inputs.fuelFlow!.unit === 't/h' ? 1000 : 1) });
    } catch (error) {
      if (!(error instanceof CalcInputError)) throw error;
    }
  }
  const options: DeriveOptions = {
    pollutantUnit: inputs.pollutant.unit === 'ppm' ? 'ppm' : inputs.pollutant.conditions === 'actual' ? 'mgPerM3Actual' : 'mgPerNm3',
    ...(inputs.pollutant.unit === 'ppm' ? { species: limit.pollutant as Species } : {}),
    pollutantBasis: inputs.pollutant.basis,
    o2Basis: inputs.o2?.basis ?? 'dry',
    referenceO2Percent: concentrationLimit ? referenceO2 : null,
    ambientO2Percent: ambient,
    correctOnlyWhenAboveReference: limit.correct_only_when_above,
    flowBasis: inputs.flow?.basis ?? 'dry',
    ...(dryFlueGasNm3PerKgFuelStoich ? { dryFlueGasNm3PerKgFuelStoich } : {}),
  };

  let derived: ReturnType<typeof deriveHourlyValues>;
  try {
    derived = deriveHourlyValues(derivedInputs, options);
  } catch (error) {
    if (!(error instanceof CalcInputError)) throw error;
    // A missing input series (no O2 channel for an O2-referenced limit, no moisture for a wet
    // channel, no T/p for actual conditions): every hour is invalid for this limit, for that reason.
    const reason = error.field === 'o2' ? 'o2_invalid' : error.field === 'moisture' ? 'moisture_invalid' : 'conditions_invalid';
    return invalidEverywhere(pollutantSeries, reason, inputs.pollutant.id);
  }

  const moisture = at(inputs.moisture);
  const moistureAt = moisture ? new Map(Array.from(moisture.t, (t, j) => [t, j])) : undefined;
  const fdNm3PerGJ = heatInputLimit && fuel && fuel.fdDscfPerMMBtu > 0 ? scfPerMMBtuToNm3PerGJ(fuel.fdDscfPerMMBtu) : null;
  const rows: LimitHourRow[] = new Array(derived.t.length);
  for (let i = 0; i < derived.t.length; i++) {
    let status = derived.status[i]!;
    let reasonCode: string | null = derived.reason[i] ? HOUR_REASONS[derived.reason[i]!]! : null;
    const o2 = derived.o2PercentDry[i]!;
    const dry = derived.dryValue[i]!;
    const mass = derived.massKgPerHour ? derived.massKgPerHour[i]! : NaN;
    let value = derived.value[i]!;
    const hasNumber = status !== HourStatusCode.invalid && status !== HourStatusCode['not-operating'];
    const fail = (reason: string) => {
      if (status !== HourStatusCode['startup-shutdown']) {
        status = HourStatusCode.invalid;
        reasonCode = reason;
      }
      value = NaN;
    };
    if (hasNumber) {
      if (limit.unit === 'ug/Nm3') value *= 1000;
      else if (limit.unit === 'ppm') value = mgPerNm3ToPpm(value, limit.pollutant as Species);
      else if (heatInputLimit) {
        // Method 19 eq. 19-1: E = C_d · Fd · 20.9/(20.9 − %O2d), in g/GJ (= ng/J) here.
        if (fdNm3PerGJ === null) fail('conditions-invalid');
        else if (!(o2 >= 0 && o2 < METHOD19_AMBIENT_O2_PERCENT)) fail(Number.isNaN(o2) ? 'o2-invalid' : 'o2-out-of-range');
        else {
          const gPerGJ = mgPerNm3AtReferenceO2ToGPerGJ(dry, { referenceO2Percent: o2, fdNm3PerGJ, ambientO2Percent: METHOD19_AMBIENT_O2_PERCENT });
          value = limit.unit === 'ng/J' ? gPerGJ : gPerGJToLbPerMMBtu(gPerGJ);
        }
      } else if (limit.unit === 'kg/h') {
        if (Number.isNaN(mass)) fail('flow-invalid');
        else value = mass;
      }
      if (limit.basis === 'wet' && concentrationLimit && Number.isFinite(value)) {
        const j = moistureAt?.get(derived.t[i]!);
        const h2o = j === undefined ? NaN : moisture!.status[j] === HourStatusCode.invalid || moisture!.status[j] === HourStatusCode['not-operating'] ? NaN : moisture!.value[j]!;
        if (h2o >= 0 && h2o < 100) value = dryToWet(value, h2o);
        else fail('moisture-invalid');
      }
    }
    rows[i] = {
      hourStart: derived.t[i]!,
      value: num(value),
      status: toDbHourStatus(HOUR_STATUSES[status]!),
      reason: reasonCode ? toDbWord(reasonCode) : null,
      o2PercentDry: num(o2),
      coverage: num(derived.coverage[i]!),
      dryMgPerNm3: num(dry),
      massKgPerHour: num(mass),
      channelId: inputs.pollutant.id,
    };
  }
  return rows;
}

function invalidEverywhere(s: HourlySeries, reason: string, channelId: string): LimitHourRow[] {
  return Array.from(s.t, (t, i) => {
    const st = s.status[i]!;
    const keep = st === HourStatusCode['not-operating'] || st === HourStatusCode['startup-shutdown'];
    return {
      hourStart: t,
      value: null,
      status: keep ? toDbHourStatus(HOUR_STATUSES[st]!) : 'invalid',
      reason: keep ? null : reason,
      o2PercentDry: null,
      coverage: num(s.coverage[i]!),
      dryMgPerNm3: null,
      massKgPerHour: null,
      channelId,
    };
  });
}
