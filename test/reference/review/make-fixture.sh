#!/usr/bin/env bash
# The book review's reference figures: drift, volatility and diversification ratio of each
# household's holdings and of its recommendation, computed by numpy with the target solved by
# cvxopt (Debian's python3-numpy and python3-cvxopt), from the invented book's prices and
# holdings. Run from the repository root after `npm run build`; CI reads only the JSON.
set -euo pipefail
cd "$(dirname "$0")/../../.."
out=test/reference/fixtures/review
mkdir -p "$out"
node test/reference/review/write_book_input.mjs "$out/book-input.json"
/usr/bin/python3 test/reference/review/review_reference.py "$out/book-input.json" "$out/book-review.json"
