// Liveness for load balancers and the benchmark's baseline: answers without touching the database.
export default defineAbilityHandler('health.check', () => ({ ok: true }))
