// A typed or scanned code at a site (?siteId=&code=) with what the swap, charge and check forms need.
export default defineAbilityHandler('site.member', event => lookupFloorCode(event))
