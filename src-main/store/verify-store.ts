import type Database from 'better-sqlite3';
import { contentDigest, storedDigest } from './backup-digest.js';
import { sha256Hex } from './canonical-json.js';
import { seriesChecksum, type SeriesRowValues } from './series-checksum.js';

export interface StoreVerdict {
  schemaVersion: number;
  /** What is damaged, each named as the user knows it ("prices of asset 'EQ1'"); [] when sound. */
  problems: string[];
  /** How many of each were checked against their checksums. */
  verified: { series: number; revisions: number; memos: number };
  /** What this store's schema keeps no checksum for, so it could not be verified. */
  unverified: string[];
}

const MAX_STRUCTURE_MESSAGES = 10;

/**
 * Checks a store in three layers: SQLite's structure (`PRAGMA integrity_check`), the rows that
 * point at one another (`foreign_key_check`), and the values against the checksum kept beside
 * each: every price and exchange-rate series (SHA-256 of its row, from schema 5), every scenario
 * revision (SHA-256 of its canonical document, its `hash`) and every memo (SHA-256 of its PDF).
 * A backup also carries a seal over all its rows (backup-digest.ts), checked last. Reads only; a
 * part that cannot be read at all is named as damaged.
 */
export function verifyDatabase(db: Database.Database): StoreVerdict {
  const schemaVersion = db.pragma('user_version', { simple: true }) as number;
  const problems: string[] = [];
  const verified = { series: 0, revisions: 0, memos: 0 };
  const unverified: string[] = [];
  const attempt = (part: string, fn: () => void) => {
    try {
      fn();
    } catch (error) {
      problems.push(`${part} cannot be read: ${(error as Error).message}`);
    }
  };

  attempt('the database structure', () => {
    const structure = (db.pragma('integrity_check') as { integrity_check: string }[])
      .map((r) => r.integrity_check)
      .filter((m) => m !== 'ok');
    for (const m of structure.slice(0, MAX_STRUCTURE_MESSAGES)) problems.push(`the database structure: ${m}`);
    if (structure.length > MAX_STRUCTURE_MESSAGES)
      problems.push(`the database structure: ${structure.length - MAX_STRUCTURE_MESSAGES} more problems`);
  });
  attempt('the links between records', () => {
    for (const r of db.pragma('foreign_key_check') as { table: string; rowid: number; parent: string }[])
      problems.push(`${r.table} row ${r.rowid} points at a missing ${r.parent}`);
  });
  const tables = new Set(db.prepare("SELECT name FROM sqlite_schema WHERE type = 'table'").pluck().all() as string[]);

  if (tables.has('price_series')) {
    const hasChecksums = (db.pragma('table_info(price_series)') as { name: string }[]).some(
      (c) => c.name === 'checksum',
    );
    if (!hasChecksums) unverified.push(`price series (store schema ${schemaVersion} keeps no checksum of them)`);
    else
      attempt('the price series', () => {
        const rows = db
          .prepare(
            `SELECT s.*, a.fx_base, a.fx_quote FROM price_series s LEFT JOIN assets a ON a.id = s.asset_id ORDER BY s.asset_id`,
          )
          .iterate() as IterableIterator<
          SeriesRowValues & { checksum: string | null; fx_base: string | null; fx_quote: string | null }
        >;
        for (const row of rows) {
          verified.series++;
          if (row.checksum === seriesChecksum(row)) continue;
          const what =
            row.fx_base !== null
              ? `exchange rates ${row.fx_quote} per ${row.fx_base} (series '${row.asset_id}')`
              : `prices of asset '${row.asset_id}'`;
          problems.push(
            `${what}: ${row.checksum === null ? 'no checksum' : 'the stored values do not match their checksum'}`,
          );
        }
      });
  }

  if (tables.has('scenario_revisions'))
    attempt('the scenario revisions', () => {
      const rows = db
        .prepare(
          `SELECT r.number, r.hash, r.document, s.name AS scenario, h.name AS household
             FROM scenario_revisions r LEFT JOIN scenarios s ON s.id = r.scenario_id
             LEFT JOIN households h ON h.id = s.household_id ORDER BY r.scenario_id, r.number`,
        )
        .iterate() as IterableIterator<{
        number: number;
        hash: string;
        document: string;
        scenario: string | null;
        household: string | null;
      }>;
      for (const r of rows) {
        verified.revisions++;
        if (sha256Hex(r.document) !== r.hash)
          problems.push(
            `revision ${r.number} of scenario '${r.scenario ?? '?'}' (household '${r.household ?? '?'}'): the document does not match its checksum`,
          );
      }
    });

  if (tables.has('memos'))
    attempt('the memos', () => {
      const rows = db
        .prepare(
          `SELECT m.id, m.title, m.printed_at, m.sha256, m.pdf, s.name AS scenario
             FROM memos m LEFT JOIN scenarios s ON s.id = m.scenario_id ORDER BY m.id`,
        )
        .iterate() as IterableIterator<{
        id: number;
        title: string | null;
        printed_at: string;
        sha256: string;
        pdf: Buffer;
        scenario: string | null;
      }>;
      for (const m of rows) {
        verified.memos++;
        if (sha256Hex(m.pdf) !== m.sha256)
          problems.push(
            `memo ${m.id}${m.title ? ` '${m.title}'` : ''} of scenario '${m.scenario ?? '?'}', printed ${m.printed_at.slice(0, 10)}: the PDF does not match its checksum`,
          );
      }
    });

  attempt('the backup seal', () => {
    const seal = storedDigest(db);
    if (seal !== undefined && seal !== contentDigest(db))
      problems.push(
        'the backup as a whole: its contents do not match the seal it was written with (a record was changed after the backup was made)',
      );
  });

  return { schemaVersion, problems, verified, unverified };
}
