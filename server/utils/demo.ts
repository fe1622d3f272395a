/**
 * The process environment as the operator set it. The bundler replaces the literal
 * `process.env.NODE_ENV` with "production" at build time, so read it through this alias.
 */
export function runtimeEnv(): NodeJS.ProcessEnv {
  return process.env
}

/**
 * Demo mode seeds an invented scenario into an empty database.
 * On by default, off for NODE_ENV=production unless TIGHTWELL_DEMO=1; TIGHTWELL_DEMO=0 turns it off anywhere.
 */
export function demoMode(env: NodeJS.ProcessEnv = runtimeEnv()): boolean {
  const flag = env.TIGHTWELL_DEMO
  if (flag === '1' || flag === 'true') return true
  if (flag === '0' || flag === 'false') return false
  return env.NODE_ENV !== 'production'
}

export const DEMO_PASSWORD = 'tightwell-demo'
