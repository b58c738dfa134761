import type { ImportDraft, ImportPreview } from '../../../core/api/imports-api';
import type { Channel } from '../../../core/api/sites-api';

/* Invented stack "Boiler 2 stack" of an invented site; values are made up for tests. */

function channel(id: string, parameter: Channel['parameter'], unit: Channel['unit'], basis: Channel['basis']): Channel {
  return {
    id,
    stackId: 'stack-b2',
    parameter,
    unit,
    basis,
    conditions: 'standard',
    rangeMin: 0,
    rangeMax: 500,
    intervalMinutes: 1,
    sourceLabel: null,
    archivedAt: null,
    version: 1,
    createdAt: '2026-10-01T00:00:00Z',
    updatedAt: '2026-10-01T00:00:00Z',
  };
}

export const noxChannel = channel('ch-nox', 'NOx', 'mg/Nm3', 'dry');
export const o2Channel = channel('ch-o2', 'O2', '%', 'dry');
export const coChannel = channel('ch-co', 'CO', 'mg/Nm3', 'dry');
export const testChannels: Channel[] = [noxChannel, o2Channel, coChannel];

export function draftFixture(overrides: Partial<ImportDraft> = {}): ImportDraft {
  return {
    id: 'imp-1',
    stackId: 'stack-b2',
    fileName: 'boiler2-2026-11.xlsx',
    sha256: 'ab'.repeat(32),
    sizeBytes: 120_000,
    format: 'xlsx',
    state: 'parsed',
    uploadedAt: '2026-12-01T08:00:00Z',
    uploadedBy: 'user-officer',
    uploadedByName: 'Demo Officer',
    rowCount: 43_200,
    span: { from: '2026-10-31T23:01:00Z', to: '2026-11-30T23:00:00Z' },
    problemCount: 2,
    counts: { rows: 43_200, cells: 172_800, problems: 2, inserted: null, unchanged: null, superseded: null, conflicts: null },
    committedAt: null,
    rolledBackAt: null,
    rollbackReason: null,
    sheetName: 'Data',
    headerRow: 1,
    timestampColumn: 0,
    timestampHeader: 'Time',
    statusColumn: null,
    intervalConvention: 'interval_end',
    intervalSeconds: 60,
    period: { from: null, to: null },
    // The value columns only, as the API answers: the timestamp (and any status) column is not among them.
    columns: [
      { index: 1, letter: 'B', header: 'NOx mg/Nm3 dry', unitHint: 'mg/Nm3', parameterHint: 'NOx', basisHint: 'dry', suggestedChannelId: 'ch-nox', suggestionSource: 'header', mappedChannelId: null, sample: [61.2, 63.8, null], numbers: 43_199, problems: 1 },
      { index: 2, letter: 'C', header: 'O2 %', unitHint: '%', parameterHint: 'O2', basisHint: null, suggestedChannelId: 'ch-o2', suggestionSource: 'header', mappedChannelId: null, sample: [3.1, 3.2, 3.0], numbers: 43_200, problems: 0 },
      { index: 3, letter: 'D', header: 'Spare 1', unitHint: null, parameterHint: null, basisHint: null, suggestedChannelId: null, suggestionSource: null, mappedChannelId: null, sample: [0, 0], numbers: 43_200, problems: 1 },
    ],
    notes: [],
    problemCountsByCode: { not_a_number: 2 },
    duplicates: 0,
    alreadyImported: null,
    failureMessage: null,
    progress: { phase: null, done: null, total: null, updatedAt: null },
    ...overrides,
  };
}

export function previewFixture(overrides: Partial<ImportPreview> = {}): ImportPreview {
  return {
    sampleRows: [
      { row: 2, t: '2026-10-31T23:01:00Z', status: 'valid', values: { 'ch-nox': 61.2, 'ch-o2': 3.1 } },
      { row: 3, t: '2026-10-31T23:02:00Z', status: 'valid', values: { 'ch-nox': 63.8, 'ch-o2': 3.2 } },
    ],
    problems: [
      { row: 4, column: 'B (NOx mg/Nm3 dry)', columnIndex: 1, value: 'ERR', code: 'not_a_number', reason: 'Not a number' },
      { row: 905, column: 'B (NOx mg/Nm3 dry)', columnIndex: 1, value: '#N/A', code: 'error_cell', reason: 'The cell holds a spreadsheet error' },
    ],
    problemCount: 2,
    perChannel: [
      { channelId: 'ch-nox', columnIndex: 1, count: 43_200, valid: 43_198, invalid: 2, min: 12.5, max: 212.4, mean: 64.1 },
      { channelId: 'ch-o2', columnIndex: 2, count: 43_200, valid: 43_200, invalid: 0, min: 2.1, max: 6.4, mean: 3.2 },
    ],
    span: { from: '2026-10-31T23:01:00Z', to: '2026-11-30T23:00:00Z' },
    intervalSeconds: 60,
    gaps: [{ from: '2026-11-12T09:00:00Z', to: '2026-11-12T10:00:00Z' }],
    duplicates: 0,
    overlap: { new: 86_398, unchanged: 0, conflicting: 0 },
    notes: [],
    ...overrides,
  };
}
