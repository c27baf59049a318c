/**
 * One name per count, used by every page, e-mail and API description that shows it, so two figures
 * that count different things never share a label (and one that counts the same thing never has two).
 */
export const COUNT_LABELS = {
  /** Rows in `screenings`: flights screened one at a time from the form or the API and saved, by the day saved. */
  savedScreenings: 'Saved screenings',
  /** Imported schedule flights whose screening finished, by flight date. */
  importedFlightsScreened: 'Imported flights screened',
  /** The usage ledger over the workspace's billing period: one unit per saved screening and per imported flight screened, by when it was screened. */
  billableUnits: 'Billable units',
} as const;

/** What each count covers, in a short line shown beside it. */
export const COUNT_HINTS = {
  savedScreenings: 'saved from the form or the API this month',
  importedFlightsScreened: 'imported flights dated this month',
  billableUnits: 'this billing period: one per saved screening and per imported flight screened, counted when screened',
} as const;
