/**
 * What a column header says about its column: which parameter, in which unit, on which basis.
 * Loggers write headers such as `NOx [mg/Nm3]`, `O2 (%) dry`, `SO₂ mg/m³ i.N. tr.`, `Flue gas flow
 * Nm³/h`, `Temp °C`. These hints feed the mapping suggestion; the officer confirms the mapping.
 */

export const channelParameters = [
  'NOx', 'NO', 'NO2', 'SO2', 'CO', 'dust', 'HCl', 'HF', 'TOC', 'NH3', 'Hg', 'CO2', 'O2', 'H2O',
  'flow', 'temperature', 'pressure', 'load', 'fuel_flow',
] as const;
export type ChannelParameter = (typeof channelParameters)[number];

export const channelUnits = ['mg/Nm3', 'ppm', 'ug/Nm3', '%', 'Nm3/h', 'm3/h', 'scfh', 'degC', 'degF', 'K', 'kPa', 'hPa', 'MW', 'kg/h', 't/h'] as const;
export type ChannelUnit = (typeof channelUnits)[number];

export interface HeaderHints {
  /** The header as written, trimmed. */
  header: string;
  /** Lower case, superscripts and symbols spelled plainly, single spaces: the key of stack maps. */
  normalised: string;
  parameter: ChannelParameter | null;
  unit: ChannelUnit | null;
  basis: 'dry' | 'wet' | null;
}

/**
 * Lower-cases and spells symbols plainly so that `NOx [mg/Nm³]` and `nox [mg/nm3]` are one key.
 *
 * @example
 * normaliseHeader('  NOₓ [mg/Nm³]  ') //=> 'nox [mg/nm3]'
 */
export function normaliseHeader(header: string): string {
  return header
    .normalize('NFKC')
    .replace(/[\u00b5\u03bc]/g, 'u')
    .replace(/\u2093/g, 'x')
    .toLowerCase()
    .replace(/\s+/g, ' ')
    .trim();
}

// Unit spellings → channel unit; keys are compared after normaliseHeader and removal of spaces.
const unitSpellings: Record<string, ChannelUnit> = {
  'mg/nm3': 'mg/Nm3', 'mg/m3n': 'mg/Nm3', 'mg/m3': 'mg/Nm3', 'mg/m3i.n.': 'mg/Nm3', 'mg/m3stp': 'mg/Nm3', 'mg/nm3tr': 'mg/Nm3',
  'ppm': 'ppm', 'ppmv': 'ppm', 'vppm': 'ppm', 'ppmvd': 'ppm', 'ppmdv': 'ppm',
  'ug/nm3': 'ug/Nm3', 'ug/m3': 'ug/Nm3', 'ug/m3n': 'ug/Nm3', 'mcg/nm3': 'ug/Nm3',
  '%': '%', 'vol%': '%', '%vol': '%', 'vol.-%': '%', 'vol.%': '%', '%v/v': '%', 'vol-%': '%', 'percent': '%',
  'nm3/h': 'Nm3/h', 'm3n/h': 'Nm3/h', 'nm3/hr': 'Nm3/h', 'm3/hi.n.': 'Nm3/h',
  'm3/h': 'm3/h', 'am3/h': 'm3/h', 'm3/hr': 'm3/h', 'bm3/h': 'm3/h',
  'scfh': 'scfh', 'scf/h': 'scfh', 'scf/hr': 'scfh', 'wscfh': 'scfh', 'dscfh': 'scfh',
  'degc': 'degC', '\u00b0c': 'degC', 'c': 'degC', 'deg.c': 'degC', 'celsius': 'degC',
  'degf': 'degF', '\u00b0f': 'degF', 'f': 'degF', 'deg.f': 'degF', 'fahrenheit': 'degF',
  'k': 'K', 'kelvin': 'K',
  'kpa': 'kPa', 'hpa': 'hPa', 'mbar': 'hPa',
  'mw': 'MW', 'mwth': 'MW', 'mwel': 'MW', 'mwe': 'MW',
  'kg/h': 'kg/h', 'kg/hr': 'kg/h', 't/h': 't/h', 't/hr': 't/h',
};

// Parameter names and synonyms (English, some German logger labels), matched as whole words on
// the normalised header. Longer names first so "fuel flow" wins over "flow", "nox" over "no".
const parameterPatterns: [RegExp, ChannelParameter][] = [
  [/\b(fuel[ -]?flow|fuel|brennstoff(menge|strom)?)\b/, 'fuel_flow'],
  [/\b(nox|nitrogen oxides|stickoxide|stickstoffoxide)\b/, 'NOx'],
  [/\b(no2|nitrogen dioxide)\b/, 'NO2'],
  [/\b(so2|sox|sulph?ur dioxide|sulfur oxides|schwefeldioxid)\b/, 'SO2'],
  [/\b(co2|carbon dioxide|kohlendioxid)\b/, 'CO2'],
  [/\b(co|carbon monoxide|kohlenmonoxid)\b/, 'CO'],
  [/\b(no|nitric oxide|nitrogen monoxide)\b(?!\.)/, 'NO'],
  [/\b(o2|oxygen|sauerstoff)\b/, 'O2'],
  [/\b(h2o|moisture|humidity|water vapou?r|feuchte)\b/, 'H2O'],
  [/\b(dust|pm|pm10|particulates?|staub|tsp)\b/, 'dust'],
  [/\b(hcl|hydrogen chloride)\b/, 'HCl'],
  [/\b(hf|hydrogen fluoride)\b/, 'HF'],
  [/\b(toc|voc|vocs|c ?org|total organic carbon|gesamt-c)\b/, 'TOC'],
  [/\b(nh3|ammonia|ammoniak)\b/, 'NH3'],
  [/\b(hg|mercury|quecksilber)\b/, 'Hg'],
  [/\b(flow|flue gas flow|volume flow|flow rate|volumenstrom|abgasvolumenstrom)\b/, 'flow'],
  [/\b(temperature|temp|temperatur|t)\b/, 'temperature'],
  [/\b(pressure|press|druck|p)\b/, 'pressure'],
  [/\b(load|output|power|leistung|last)\b/, 'load'],
];

/** Splits `NOx [mg/Nm3] dry` into the name part and the bracketed or trailing unit text. */
function unitCandidates(normalised: string): string[] {
  const candidates: string[] = [];
  for (const match of normalised.matchAll(/[[(]([^\])]*)[\])]/g)) candidates.push(match[1]!);
  const outside = normalised.replace(/[[(][^\])]*[\])]/g, ' ');
  for (const token of outside.split(/[\s,;]+/)) if (token) candidates.push(token);
  return candidates;
}

function unitOf(candidate: string): ChannelUnit | null {
  const key = candidate.replace(/\s+/g, '').replace(/,?(dry|tr\.?|trocken|wet|feucht)$/, '');
  return unitSpellings[key] ?? null;
}

/**
 * Reads the hints out of one header.
 *
 * @example
 * headerHints('NOx [mg/Nm³] dry') //=> { parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', … }
 * headerHints('Temp °C')          //=> { parameter: 'temperature', unit: 'degC', basis: null, … }
 */
export function headerHints(header: string): HeaderHints {
  const normalised = normaliseHeader(header);
  let unit: ChannelUnit | null = null;
  for (const candidate of unitCandidates(normalised)) {
    unit = unitOf(candidate);
    if (unit) break;
  }
  // Units such as "mg/Nm3" contain letters that could look like names ("m", "n"): match names on
  // the header with its units removed.
  const namePart = normalised
    .replace(/[[(][^\])]*[\])]/g, ' ')
    .split(/\s+/)
    .filter((token) => !unitOf(token))
    .join(' ');
  let parameter: ChannelParameter | null = null;
  for (const [pattern, candidate] of parameterPatterns) {
    if (pattern.test(namePart.replace(/_/g, ' '))) {
      parameter = candidate;
      break;
    }
  }
  let basis: 'dry' | 'wet' | null = null;
  if (/\b(dry|trocken|tr)\b|\btr\.|\bdb\b/.test(normalised)) basis = 'dry';
  else if (/\b(wet|feucht|wb)\b/.test(normalised) && parameter !== 'H2O') basis = 'wet';
  return { header: header.trim(), normalised, parameter, unit, basis };
}

/** Headers that name the timestamp column. */
export function looksLikeTimestampHeader(normalised: string): boolean {
  return /\b(timestamp|time ?stamp|date ?time|datetime|date|time|zeit|zeitstempel|datum|uhrzeit|period end|period start|interval end|interval start)\b/.test(normalised);
}

/** Headers that name a status/validity column. */
export function looksLikeStatusHeader(normalised: string): boolean {
  return /^(status|state|flag|flags|quality|validity|code|status code|data status|zustand|kennung)$/.test(normalised.replace(/[[(].*[\])]/, '').trim());
}
