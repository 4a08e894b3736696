// Propane: pounds and gallons by month and truck, cost, refused refills, requalifications due.
export default defineAbilityHandler('report.fleet', event => serveReport(event, 'report.fleet', propaneReport))
