// Energy and cost by month, charging area and charger (?siteId=<id>|all&from&to&format=csv&section=).
export default defineAbilityHandler('report.fleet', event => serveReport(event, 'report.fleet', energyReport))
