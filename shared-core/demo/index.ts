/** The invented demonstration household and its synthetic prices (see generate.ts). */
export { generateDemo, DEFAULT_DEMO_SEED, DEMO_FX_ID, DEMO_UNIVERSE_NAME, type DemoData } from './generate.js';
export { demoFiles, widePriceCsv, DEMO_FILE_NAMES, DEMO_HOUSEHOLD_FORMAT, type DemoFile } from './files.js';
export { DEMO_NOTICE } from './household.js';
export { DEMO_SCENARIO_NAME } from './scenario.js';
export { demoAssets, type DemoAssetSpec } from './assets.js';
