/** How the shell or the web host sets up the service over an open store. */
export interface ServiceOptions {
  /** Shown in app.info; defaults to the version in package.json. */
  version?: string;
  /** The store holds the invented demonstration data (`holdfast serve --demo`). */
  demo?: boolean;
  /** The page to open first; for a demo store the first scenario of its first household by default. */
  startAt?: { householdId: string; scenarioId: string };
  /** JSON file of advisor settings (prepared-by initials); settings last the session only without it. */
  settingsPath?: string;
  /** Clock for the import jobs and drafts (tests pass a fixed one). */
  now?: () => Date;
}
