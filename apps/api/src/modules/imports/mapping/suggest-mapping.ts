/**
 * Suggests which channel each value column of a file feeds, from (strongest first):
 * 1. the stack's saved column map (the officer's earlier choice for this header, including
 *    "leave this column out");
 * 2. a channel whose logger label (source_label) is this header;
 * 3. the parameter named in the header, with its unit and basis: a unit that contradicts the
 *    channel's unit rules the channel out (a ppm column must not feed a mg/Nm3 channel).
 * Each channel is suggested for one column at most; the best-scoring pairs are taken first.
 * The officer confirms or changes the result.
 */
import type { HeaderHints } from '../parse/headers';
import { normaliseHeader } from '../parse/headers';

export interface MappableColumn {
  index: number;
  hints: HeaderHints;
}

export interface MappableChannel {
  id: string;
  parameter: string;
  unit: string;
  basis: 'wet' | 'dry';
  sourceLabel: string | null;
}

export type StackMapEntry = { role: 'channel'; channelId: string } | { role: 'ignore' } | { role: 'timestamp' } | { role: 'status' };

export type SuggestionSource = 'stack_map' | 'source_label' | 'header';

export interface Suggestion {
  index: number;
  channelId: string | null;
  source: SuggestionSource | null;
}

function headerScore(hints: HeaderHints, channel: MappableChannel): number {
  if (hints.parameter === null || hints.parameter !== channel.parameter) return 0;
  let score = 100;
  if (hints.unit !== null) {
    if (hints.unit !== channel.unit) return 0;
    score += 20;
  }
  if (hints.basis !== null) score += hints.basis === channel.basis ? 10 : -30;
  return score;
}

/**
 * @example
 * suggestMapping(
 *   [{ index: 1, hints: headerHints('NOx [mg/Nm3]') }],
 *   [{ id: 'c1', parameter: 'NOx', unit: 'mg/Nm3', basis: 'dry', sourceLabel: null }],
 *   new Map(),
 * ) //=> [{ index: 1, channelId: 'c1', source: 'header' }]
 */
export function suggestMapping(
  columns: readonly MappableColumn[],
  channels: readonly MappableChannel[],
  stackMap: ReadonlyMap<string, StackMapEntry>,
): Suggestion[] {
  const liveIds = new Set(channels.map((c) => c.id));
  const pairs: { index: number; channelId: string; score: number; source: SuggestionSource }[] = [];
  const ignored = new Set<number>();
  for (const column of columns) {
    const saved = stackMap.get(column.hints.normalised);
    if (saved?.role === 'ignore') {
      ignored.add(column.index);
      continue;
    }
    if (saved?.role === 'channel' && liveIds.has(saved.channelId)) {
      pairs.push({ index: column.index, channelId: saved.channelId, score: 1000, source: 'stack_map' });
    }
    // The logger label may stand alone or with its unit ("K2_NOX [mg/Nm3]").
    const nameOnly = column.hints.normalised.replace(/\s*[[(][^\])]*[\])]\s*$/, '');
    for (const channel of channels) {
      const label = channel.sourceLabel ? normaliseHeader(channel.sourceLabel) : null;
      if (label && (label === column.hints.normalised || label === nameOnly)) {
        pairs.push({ index: column.index, channelId: channel.id, score: 900, source: 'source_label' });
      }
      const score = headerScore(column.hints, channel);
      if (score > 0) pairs.push({ index: column.index, channelId: channel.id, score, source: 'header' });
    }
  }
  // Best pairs first; on equal scores the leftmost column wins, so the result does not depend on
  // the order channels happen to come from the database.
  pairs.sort((a, b) => b.score - a.score || a.index - b.index || a.channelId.localeCompare(b.channelId));
  const byColumn = new Map<number, { channelId: string; source: SuggestionSource }>();
  const takenChannels = new Set<string>();
  for (const pair of pairs) {
    if (byColumn.has(pair.index) || takenChannels.has(pair.channelId) || ignored.has(pair.index)) continue;
    byColumn.set(pair.index, { channelId: pair.channelId, source: pair.source });
    takenChannels.add(pair.channelId);
  }
  return columns.map((column) => {
    const chosen = byColumn.get(column.index);
    return { index: column.index, channelId: chosen?.channelId ?? null, source: chosen?.source ?? null };
  });
}
