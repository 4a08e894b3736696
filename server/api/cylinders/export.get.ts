// The cylinders list as filtered, as CSV (same query as the list, no paging).
export default defineAbilityHandler('site.member', event => exportAssets(event, 'cylinder'))
