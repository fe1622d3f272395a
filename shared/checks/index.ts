export * from './judge'
export * from './schema'
