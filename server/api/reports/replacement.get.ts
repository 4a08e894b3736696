// Replacement forecast: when each battery reaches its rated cycles at its recent rate, and the cost by quarter.
export default defineAbilityHandler('report.fleet', event => serveReport(event, 'report.fleet', replacementReport))
