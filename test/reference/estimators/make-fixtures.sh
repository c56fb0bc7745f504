#!/bin/sh
# Regenerates test/reference/fixtures/estimators/*.json from Debian's R and Python (not the
# pyenv python3): the open data set first, then the estimator references computed from it, then
# the 60-digit mpmath evaluation of the nonlinear shrinkage's kernel terms.
set -e
cd "$(dirname "$0")/../../.."
/usr/bin/Rscript test/reference/estimators/eustockmarkets.R
/usr/bin/Rscript test/reference/estimators/desmoothing.R
/usr/bin/python3 test/reference/estimators/make_fixtures.py
/usr/bin/python3 test/reference/estimators/nonlinear_hilbert.py
