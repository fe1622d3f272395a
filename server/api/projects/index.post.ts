import { ProjectBody } from '#shared/filings'
import { projects } from '../../database/schema'

// A rater starts a project: the county comes from the address (422 when the postal code spans
// several and none was chosen), and a county shared by several jurisdictions needs one named.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'rater')
  const body = await readBodyAs(event, ProjectBody)
  const county = await projectCounty(body, event)
  const db = await useDb()
  const [row] = await db.insert(projects).values({ ...projectValues(body, county), ownerId: user.id }).returning()
  setResponseStatus(event, 201)
  return projectDetail(row!)
})
