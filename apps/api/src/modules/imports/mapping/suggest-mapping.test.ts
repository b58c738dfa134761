import { headerHints } from '../parse/headers';
import { suggestMapping, type MappableChannel } from './suggest-mapping';

const channels: MappableChannel[] = [
  { id: 'nox', parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', sourceLabel: null },
  { id: 'o2dry', parameter: 'O2', unit: '%', basis: 'dry', sourceLabel: null },
  { id: 'o2wet', parameter: 'O2', unit: '%', basis: 'wet', sourceLabel: null },
  { id: 'co', parameter: 'CO', unit: 'mg/Nm3', basis: 'dry', sourceLabel: 'K2_CO' },
];

const columns = (...headers: string[]) => headers.map((h, i) => ({ index: i + 1, hints: headerHints(h) }));

describe('suggestMapping', () => {
  it('matches parameter, unit and basis, each channel once', () => {
    expect(suggestMapping(columns('NOx [mg/Nm3]', 'O2 wet [%]', 'O2 dry [%]'), channels, new Map()).map((s) => s.channelId)).toEqual(['nox', 'o2wet', 'o2dry']);
  });

  it('never feeds a ppm column into a mg/Nm3 channel', () => {
    expect(suggestMapping(columns('NOx [ppm]'), channels, new Map())[0]!.channelId).toBeNull();
  });

  it('uses the logger label, also with a unit after it', () => {
    expect(suggestMapping(columns('K2_CO [mg/Nm3]'), channels, new Map())[0]).toEqual({ index: 1, channelId: 'co', source: 'source_label' });
  });

  it('prefers the saved stack map, including a column the officer left out', () => {
    const map = new Map([
      ['analyser 1', { role: 'channel' as const, channelId: 'nox' }],
      ['nox [mg/nm3]', { role: 'ignore' as const }],
    ]);
    expect(suggestMapping(columns('Analyser 1', 'NOx [mg/Nm3]'), channels, map).map((s) => [s.channelId, s.source])).toEqual([
      ['nox', 'stack_map'],
      [null, null],
    ]);
  });

  it('ignores a saved entry for a channel that is no longer live', () => {
    const map = new Map([['analyser 1', { role: 'channel' as const, channelId: 'archived' }]]);
    expect(suggestMapping(columns('Analyser 1'), channels, map)[0]!.channelId).toBeNull();
  });
});
