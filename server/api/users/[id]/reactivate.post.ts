export default defineEventHandler(event => setActive(event, true))
