// Swaps and charges recorded despite a refused check or with a warning (?siteId=), for leads.
export default defineAbilityHandler('report.view', event => batteryRoomOverrides(event))
