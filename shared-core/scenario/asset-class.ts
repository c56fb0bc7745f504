/**
 * Asset classes have one spelling: lower case, words joined by hyphens ("Equity", " equity ",
 * "Real assets", "real_assets" are "equity" and "real-assets"). Scenario files, the store and the
 * demo's tags arrive in different spellings; the scenario document and the store keep this one,
 * so a class is never counted twice ("Equity" beside "equity" in a stress table).
 */
export function canonicalAssetClass(text: string): string {
  return text
    .trim()
    .toLowerCase()
    .replace(/[\s_-]+/g, '-');
}

/** An asset class in words for a table or a sentence: "real-estate" is "real estate". */
export function assetClassWords(assetClass: string): string {
  return canonicalAssetClass(assetClass).replace(/-/g, ' ');
}
