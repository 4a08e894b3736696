// Battery health: cycles against rated, capacity per charge over time, cell spread, the fleet by risk.
export default defineAbilityHandler('report.fleet', event => serveReport(event, 'report.fleet', batteryHealthReport))
