// Compliance: emissions pass rate and retests, indoor CO TWA by area, area-log completion, evaluations due.
export default defineAbilityHandler('report.view', event => serveReport(event, 'report.view', complianceReport))
