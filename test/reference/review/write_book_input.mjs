// Writes the invented book (shared-core/demo/book.ts, default settings) as the reference
// script's input. Run after `npm run build` from the repository root, by make-fixture.sh.
import { writeFileSync } from 'node:fs';
import { generateBook } from '../../../dist/shared-core/demo/book.js';

writeFileSync(process.argv[2], JSON.stringify(generateBook()) + '\n');
