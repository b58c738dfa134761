/**
 * The optional status column of a logger export: what state the measurement was in for that row
 * (one status per row, for every channel of the row). Loggers write words or short codes; these
 * are the spellings we accept. An unknown word is reported, never treated as valid.
 */

export const readingStatuses = [
  'valid', 'calibration', 'maintenance', 'fault', 'out_of_range', 'not_operating', 'startup_shutdown',
  'substituted', 'invalidated',
] as const;
export type ReadingStatus = (typeof readingStatuses)[number];

/** Statuses an import may bring in (the last two come only from corrections). */
export type ImportedStatus = Exclude<ReadingStatus, 'substituted' | 'invalidated'>;

const spellings: Record<string, ImportedStatus> = {
  '': 'valid', 'valid': 'valid', 'ok': 'valid', 'normal': 'valid', 'good': 'valid', 'v': 'valid', 'operating': 'valid',
  'in operation': 'valid', 'gültig': 'valid', 'gueltig': 'valid', 'run': 'valid',
  'calibration': 'calibration', 'cal': 'calibration', 'calib': 'calibration', 'zero': 'calibration', 'span': 'calibration',
  'zero/span': 'calibration', 'zero check': 'calibration', 'span check': 'calibration', 'kalibrierung': 'calibration',
  'kal': 'calibration', 'qal3': 'calibration', 'check': 'calibration',
  'maintenance': 'maintenance', 'maint': 'maintenance', 'service': 'maintenance', 'wartung': 'maintenance', 'm': 'maintenance',
  'fault': 'fault', 'error': 'fault', 'err': 'fault', 'failure': 'fault', 'alarm': 'fault', 'outage': 'fault', 'f': 'fault',
  'störung': 'fault', 'stoerung': 'fault', 'analyser fault': 'fault', 'analyzer fault': 'fault', 'invalid': 'fault',
  'out of range': 'out_of_range', 'out_of_range': 'out_of_range', 'oor': 'out_of_range', 'over range': 'out_of_range',
  'overrange': 'out_of_range', 'under range': 'out_of_range', 'range': 'out_of_range',
  'not operating': 'not_operating', 'not_operating': 'not_operating', 'off': 'not_operating', 'plant off': 'not_operating',
  'standstill': 'not_operating', 'stillstand': 'not_operating', 'idle': 'not_operating', 'stop': 'not_operating',
  'startup': 'startup_shutdown', 'start-up': 'startup_shutdown', 'start up': 'startup_shutdown', 'shutdown': 'startup_shutdown',
  'shut-down': 'startup_shutdown', 'shut down': 'startup_shutdown', 'su/sd': 'startup_shutdown', 'startup_shutdown': 'startup_shutdown',
  'anfahren': 'startup_shutdown', 'abfahren': 'startup_shutdown',
};

/**
 * Reads one status cell; null when the word is unknown.
 *
 * @example
 * parseStatusText(' CAL ') //=> 'calibration'
 * parseStatusText('')      //=> 'valid'
 * parseStatusText('??')    //=> null
 */
export function parseStatusText(raw: string): ImportedStatus | null {
  return spellings[raw.trim().toLowerCase().replace(/\s+/g, ' ')] ?? null;
}
