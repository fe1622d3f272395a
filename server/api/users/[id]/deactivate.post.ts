export default defineEventHandler(event => setActive(event, false))
