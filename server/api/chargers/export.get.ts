// The chargers list as filtered, as CSV (same query as the list, no paging).
export default defineEventHandler(event => exportAssets(event, 'charger'))
