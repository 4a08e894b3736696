// List batteries at a site: paged, sorted, filtered (?siteId=&page=&sort=&dir=&q=&<filter>=).
export default defineEventHandler(event => listAssets(event, 'battery'))
