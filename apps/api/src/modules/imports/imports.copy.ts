/**
 * Bulk loading with COPY … FROM STDIN (pg-copy-streams) on the connection of a knex transaction,
 * so the load is part of the transaction and rolls back with it.
 */
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Knex } from 'knex';
import type { PoolClient } from 'pg';
import { from as copyFrom } from 'pg-copy-streams';

/** Escapes one field for COPY's text format (null → \N). */
export function copyField(value: string | number | null): string {
  if (value === null) return '\\N';
  if (typeof value === 'number') return String(value);
  return value.replace(/[\\\t\n\r]/g, (ch) => (ch === '\\' ? '\\\\' : ch === '\t' ? '\\t' : ch === '\n' ? '\\n' : '\\r'));
}

/**
 * Streams lines (without newline) into `COPY <target> FROM STDIN` on the transaction's connection.
 * Lines are sent in chunks of a few hundred to keep the number of stream writes small.
 */
export async function copyLines(trx: Knex.Transaction, copySql: string, lines: Iterable<string>): Promise<void> {
  // A knex transaction's client hands out the transaction's own connection.
  const connection = (await (trx.client as { acquireConnection(): Promise<PoolClient> }).acquireConnection()) as PoolClient;
  const stream = connection.query(copyFrom(copySql));
  function* chunks(): Generator<string> {
    let buffer: string[] = [];
    for (const line of lines) {
      buffer.push(line);
      if (buffer.length >= 500) {
        yield `${buffer.join('\n')}\n`;
        buffer = [];
      }
    }
    if (buffer.length > 0) yield `${buffer.join('\n')}\n`;
  }
  await pipeline(Readable.from(chunks()), stream);
}
