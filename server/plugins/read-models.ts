// A migration that changes what the read models hold sets read_model_rebuilds.needed; the first server
// to start after it recomputes them from the records (set-up does the same before the demo and the tests).
export default defineNitroPlugin(() => {
  if (process.env.BAYWARD_REBUILD_AT_START === 'false') return
  rebuildReadModelsIfNeeded(useDb(), line => console.log(line))
    .then((report) => {
      if (report) console.log(`read models rebuilt: ${report.sites} sites, ${report.obligations} obligations in ${(report.ms / 1000).toFixed(1)} s`)
    })
    .catch(error => console.error('read-model rebuild at start failed; run `npm run rebuild-state`', error))
})
