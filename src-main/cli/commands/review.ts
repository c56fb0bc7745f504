import { resolveColumns, reviewColumns, STATUS_WORDS } from '../../../shared-core/review/columns.js';
import { InputError } from '../../../shared-core/errors.js';
import { reviewBook, type BookReview } from '../../app/review-book.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';
import { csvField, textTable } from '../text-table.js';
import { writeOutputFile } from '../write-output.js';
import { existingStore } from './store-access.js';

/** Exit code when at least one household needs attention (or cannot be computed). */
export const EXIT_ATTENTION = 4;

/** Columns too wide for a terminal's table: their words follow it, household by household. */
const WORDS_ONLY = new Set(['breaches', 'reviewed']);

/**
 * `holdfast review`: the book review for scripts and a monthly batch (the same rows as the book
 * screen, from app/review-book.ts). Reads the store only.
 */
export async function runReview(options: OptionValues, io: CliIO): Promise<number> {
  const storeName = options.store as string;
  const store = existingStore(io.cwd, storeName);
  let review: BookReview;
  try {
    const total = store.listHouseholds().length;
    const every = Math.max(1, Math.ceil(total / 10));
    review = reviewBook(store, {
      resolve: options.resolve === true,
      onProgress: (done, all) => {
        if (total > 10 && (done % every === 0 || done === all))
          io.stderr(`holdfast review: ${done} of ${all} households\n`);
      },
    });
  } catch (error) {
    if (error instanceof InputError && error.location.file === undefined) throw error.inFile(storeName);
    throw error;
  } finally {
    store.close();
  }
  const columns = [...reviewColumns, ...(options.resolve ? resolveColumns : [])];
  if (typeof options.csv === 'string') {
    const lines = [
      [...columns.map((c) => c.heading), 'Reasons'].map(csvField).join(','),
      ...review.rows.map((r) => [...columns.map((c) => c.text(r)), r.reasons.join('; ')].map(csvField).join(',')),
    ];
    writeOutputFile(io.cwd, options.csv, lines.join('\r\n') + '\r\n');
  }
  if (options.json) io.stdout(JSON.stringify(review, null, 2) + '\n');
  else {
    const shown = columns.filter((c) => !WORDS_ONLY.has(c.key));
    const lines = textTable(
      shown.map((c) => c.heading),
      review.rows.map((r) => shown.map((c) => c.text(r))),
      shown.map((c) => c.numeric),
    );
    const attention = review.rows.filter((r) => r.status !== 'ok');
    lines.push('');
    if (review.rows.length === 0) lines.push('The store holds no households.');
    else if (attention.length === 0) lines.push(`All ${review.rows.length} households are in order.`);
    else {
      lines.push(`${attention.length} of ${review.rows.length} households need attention:`);
      for (const r of attention) {
        lines.push(`  ${r.household} (${STATUS_WORDS[r.status]}):`);
        for (const reason of r.reasons) lines.push(`    - ${reason}`);
      }
    }
    if (typeof options.csv === 'string') lines.push('', `wrote ${options.csv}`);
    io.stdout(lines.join('\n') + '\n');
  }
  return review.rows.some((r) => r.status !== 'ok') ? EXIT_ATTENTION : EXIT.ok;
}
