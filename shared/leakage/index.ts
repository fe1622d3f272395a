/**
 * Tightwell leakage engine: pure TypeScript, runs on the server and in the browser.
 * Import through `#shared/leakage`.
 */
export * from './units'
export * from './types'
export * from './regression'
export * from './analyze'
export * from './metrics'
export * from './target'
export * from './schema'
