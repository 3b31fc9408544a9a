/**
 * The response header of an answer computed from the data version before the newest, served while
 * the newest is being built: `Backsight-Data-Stale: version=41; newest=42` (the API's
 * answer-freshness.ts sets it, the dashboard's api/freshness.ts acts on it).
 */
export const DATA_STALE_HEADER = 'Backsight-Data-Stale'
