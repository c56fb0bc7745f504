# Writes test/reference/fixtures/estimators/eustockmarkets.json: the daily closes of the open
# data set datasets::EuStockMarkets that ships with R (Debian r-base-core), and R's own MAD
# scales (stats::mad, constant 1.4826) of its log returns as an outside check of the robust
# estimator's scales. Run through make-fixtures.sh with /usr/bin/Rscript.
#
# The data set is a regular series of 1860 business-day closes with no calendar attached; the
# fixture gives the rows consecutive weekdays from 1991-07-01 so they can go through the price
# file and the returns engine. The four columns keep their order under neutral ids EU1..EU4.
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) > 0) args[1] else "test/reference/fixtures/estimators/eustockmarkets.json"

x <- unclass(EuStockMarkets)
closes <- matrix(as.numeric(x), nrow = nrow(x))
days <- seq(as.Date("1991-07-01"), by = "day", length.out = 3 * nrow(closes))
days <- days[!(format(days, "%u") %in% c("6", "7"))][seq_len(nrow(closes))]
logret <- diff(log(closes))
num <- function(v) paste(sprintf("%.17g", v), collapse = ",")
rows <- vapply(seq_len(nrow(closes)), function(i) paste0("[", num(closes[i, ]), "]"), "")
json <- paste0(
  "{\n",
  "\"source\": \"datasets::EuStockMarkets, ", R.version.string, "\",\n",
  "\"assets\": [\"EU1\",\"EU2\",\"EU3\",\"EU4\"],\n",
  "\"dates\": [", paste0("\"", format(days, "%Y-%m-%d"), "\"", collapse = ","), "],\n",
  "\"closes\": [\n", paste(rows, collapse = ",\n"), "\n],\n",
  "\"madOfLogReturns\": [", num(apply(logret, 2, mad)), "],\n",
  "\"medianOfLogReturns\": [", num(apply(logret, 2, median)), "]\n",
  "}\n"
)
writeLines(json, out, sep = "")
