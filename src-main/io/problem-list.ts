/**
 * The problems of a price file, bounded: the first LISTED in file order (line, then column) are
 * kept with their location, the rest only counted, so a file of a million bad lines costs the
 * memory and the output of twenty (issue 16: at most 20 located problems plus a count).
 */
export const LISTED = 20;

export type ProblemKind = 'file' | 'row' | 'date' | 'unparseable' | 'non-positive' | 'repeated-date' | 'jump';

export interface LocatedProblem {
  kind: ProblemKind;
  line?: number;
  column?: number;
  /** The asset whose cell it is, if any. */
  asset?: string;
  message: string;
  /** Repeated dates: the lines that carry the date. */
  lines?: number[];
  /** Jumps: the relative move and the dates around it. */
  change?: number;
  date?: string;
  previousDate?: string;
}

export class ProblemList {
  readonly listed: LocatedProblem[] = [];
  count = 0;

  constructor(private readonly limit = LISTED) {}

  add(p: LocatedProblem): void {
    this.count++;
    const list = this.listed;
    if (list.length === this.limit && !before(p, list[list.length - 1])) return;
    let i = list.length;
    while (i > 0 && before(p, list[i - 1])) i--;
    list.splice(i, 0, p);
    if (list.length > this.limit) list.pop();
  }

  /**
   * Counts a problem at `line` that would not be listed (the list is full of earlier ones) and
   * says so; a reader then skips building its message. False when it must be added.
   */
  countedOnly(line: number): boolean {
    const list = this.listed;
    if (list.length < this.limit || (list[list.length - 1].line ?? 0) > line) return false;
    this.count++;
    return true;
  }

  /** Problems found but not listed. */
  get unlisted(): number {
    return this.count - this.listed.length;
  }
}

/** File-wide problems (no line) first, then by line and column. */
function before(p: LocatedProblem, q: LocatedProblem): boolean {
  const pl = p.line ?? 0;
  const ql = q.line ?? 0;
  return pl < ql || (pl === ql && (p.column ?? 0) < (q.column ?? 0));
}
