// Public: a liveness answer with no database work (also the bare route the benchmarks compare against).
export default defineEventHandler(() => ({ ok: true, service: 'tightwell' }))
