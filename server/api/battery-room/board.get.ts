// The Bay board for a site or one charging area (?siteId=&areaId=&truckId=): every battery by state, and the suggested battery for a truck.
export default defineAbilityHandler('site.member', event => batteryBoard(event))
