/**
 * An asset id as a price file, the store and a household file name it: a letter or digit, then
 * letters, digits, dots, dashes or underscores. Letters of any script (a header saved in
 * Windows-1252 may spell `Actions_Été`), no blanks, so that an id reads the same on the command
 * line, in a scenario and in the memo.
 */
export const ASSET_ID = /^[\p{L}\p{Nd}][\p{L}\p{Nd}._-]*$/u;

export const ASSET_ID_RULE = 'expected letters, digits, dot, dash or underscore';
