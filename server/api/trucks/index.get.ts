// List trucks at a site: paged, sorted, filtered (?siteId=&page=&sort=&dir=&q=&<filter>=).
export default defineAbilityHandler('site.member', event => listAssets(event, 'truck'))
