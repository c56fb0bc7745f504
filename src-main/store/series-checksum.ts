import { createHash } from 'node:crypto';

/** One stored price or exchange-rate series as its row holds it (see migration 1). */
export interface SeriesRowValues {
  asset_id: string;
  points: number;
  first_day: number | null;
  last_day: number | null;
  days: Uint8Array;
  closes: Uint8Array;
  batches: Uint8Array;
}

/**
 * SHA-256 of every column of a price_series row, each blob preceded by its length so that no
 * byte can move from one column to the next unnoticed. `PRAGMA integrity_check` vouches for the
 * database's structure only; this vouches for the values (a flipped byte in a close).
 */
export function seriesChecksum(row: SeriesRowValues): string {
  const hash = createHash('sha256');
  hash.update(`holdfast-series@1\0${row.asset_id}\0${row.points}\0${row.first_day ?? ''}\0${row.last_day ?? ''}\0`);
  for (const blob of [row.days, row.closes, row.batches]) {
    hash.update(`${blob.byteLength}\0`);
    hash.update(blob);
  }
  return hash.digest('hex');
}
