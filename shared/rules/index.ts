/** The rule core: variables, zones, FIPS, logic rules, limits tables, CSV. Pure TypeScript. */
export * from './variables'
export * from './zones'
export * from './fips'
export * from './logic'
export * from './table'
export * from './csv'
export * from './resolve'
