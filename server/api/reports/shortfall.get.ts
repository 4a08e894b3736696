// Fleet sizing: swaps short of a ready battery by hour and area, and batteries per truck by voltage.
export default defineAbilityHandler('report.fleet', event => serveReport(event, 'report.fleet', shortfallReport))
