export * from './judge'
export * from './schema'
export * from './types'
