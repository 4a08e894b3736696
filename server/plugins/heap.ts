import { setFlagsFromString } from 'node:v8'
import { heapGrowingPercent } from '../utils/heap-growing'

// How far the JavaScript heap may grow past what the last full garbage collection kept, before the next one.
// Left to V8, the limit grows by a factor of up to 4 and the first one is large, so a server that keeps ~35 MB
// of live data held 250–310 MB at the peak of the benchmark: garbage not yet collected. A fixed factor of 2
// (BAYWARD_HEAP_GROWING_PERCENT=100, the default) held 220–240 MB at a cost within the machine's spread; 0 leaves
// V8's own. V8 reads the factor at every collection, so it can be set once the process runs.
export default defineNitroPlugin(() => {
  const percent = heapGrowingPercent(process.env.BAYWARD_HEAP_GROWING_PERCENT)
  if (percent > 0) setFlagsFromString(`--heap-growing-percent=${percent}`)
})
