import { CommentBody } from '#shared/filings'
import { IdParams } from '#shared/schemas/people'
import { filingComments } from '../../../database/schema'

// The thread of a filing: its rater, its jurisdiction's reviewers and admins may write.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = paramsAs(event, IdParams)
  const { body } = await readBodyAs(event, CommentBody)
  const filing = await findFilingFor(user, id)
  const db = await useDb()
  const [row] = await db.insert(filingComments).values({ filingId: filing.id, userId: user.id, userName: user.name, role: user.role, body }).returning()
  setResponseStatus(event, 201)
  return { id: row!.id, userId: row!.userId, userName: row!.userName, role: row!.role, body: row!.body, at: row!.at.toISOString() }
})
