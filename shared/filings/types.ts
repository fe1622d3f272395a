/** Shapes the project, test, filing, outbox and verify routes answer. */
import type { CheckResponse, Verdict } from '../checks'
import type { MailKind, MailStatus, TestStage, UploadKind } from './constants'
import type { FilingSnapshot, ProjectSnapshot, SnapshotChange, StatedComparison, TestSnapshot } from './snapshot'
import type { FilingAction, FilingState } from './states'

export interface TestCheckSummary {
  verdict: Verdict
  cfm50: number
  ach50: number
  cfm50PerEnclosureArea: number | null
  /** The limit the test was held against (the first limit rule), for the plot's limit line. */
  limit: { metric: string | null, value: number | null, summary: string, citation: string } | null
  ruleSetVersion: { id: number, number: number, publishedAt: string } | null
  checkedAt: string
}

export interface UploadInfo {
  id: number
  testId: number | null
  kind: UploadKind
  name: string
  contentType: string
  size: number
  sha256: string
  createdAt: string
  url: string
}

export interface TestSummary {
  id: number
  projectId: number
  testedOn: string
  stage: TestStage
  tester: string
  readingCount: number
  check: TestCheckSummary | null
  filing: { id: number, status: FilingState } | null
}

export interface TestRecord extends TestSnapshot {
  id: number
  projectId: number
  /** The stored check of the current readings (null without readings). */
  check: CheckResponse | null
  /** Why there is no check, when there are readings but the check could not run. */
  checkProblem: string | null
  uploads: UploadInfo[]
  filing: { id: number, status: FilingState, version: number } | null
  /** True while a filing of this test is with the jurisdiction or accepted: edits are refused. */
  frozen: boolean
  project: ProjectInfo
}

export interface ProjectInfo extends ProjectSnapshot {
  id: number
  ownerId: number
  ownerName: string
  jurisdictionName: string | null
  /** The jurisdictions that cover the project's county when there are several (else empty). */
  jurisdictionChoices: { id: number, name: string }[]
  createdAt: string
  updatedAt: string
}

export interface ProjectSummary {
  id: number
  addressLine: string
  city: string
  stateCode: string
  permitNumber: string
  permitDate: string
  builderCompany: string
  ownerName: string
  testCount: number
  latestTest: { id: number, testedOn: string, stage: TestStage, verdict: Verdict | null, ach50: number | null } | null
  latestFiling: { id: number, status: FilingState } | null
  updatedAt: string
}

export interface ProjectDetail extends ProjectInfo {
  tests: TestSummary[]
  /** True while any filing of the project is with the jurisdiction or accepted. */
  frozen: boolean
}

export interface QueueRow {
  id: number
  status: FilingState
  version: number
  submittedAt: string | null
  addressLine: string
  city: string
  permitNumber: string
  permitDate: string
  zone: string | null
  verdict: Verdict | null
  cfm50: number | null
  ach50: number | null
  stage: TestStage
  testedOn: string
  raterId: number
  raterName: string
  reviewerName: string | null
  jurisdictionName: string
  revision: number
}

export interface QueuePage {
  rows: QueueRow[]
  total: number
  page: number
  pageSize: number
  /** The raters in scope, for the filter (id, name). */
  raters: { id: number, name: string }[]
  /** The zones in scope, for the filter. */
  zones: string[]
}

export interface FilingSummaryCounts {
  byStatus: Partial<Record<FilingState, number>>
  waiting: number
  latest: QueueRow[]
}

export interface TransitionInfo {
  id: number
  action: FilingAction
  fromState: FilingState | null
  toState: FilingState
  userName: string
  note: string
  revision: number | null
  at: string
}

export interface CommentInfo { id: number, userId: number | null, userName: string, role: string, body: string, at: string }

export interface RevisionInfo {
  number: number
  submittedAt: string
  submittedByName: string
  verdict: Verdict
  ruleSetVersion: { id: number, number: number, publishedAt: string } | null
  /** What changed from the revision before (empty for the first). */
  changes: SnapshotChange[]
}

export interface CertificateInfo {
  code: string
  verifyUrl: string
  issuedAt: string
  pdfUrl: string
}

export interface CertificateData {
  code: string
  verifyUrl: string
  address: string
  permitNumber: string
  permitDate: string
  testedOn: string
  stage: TestStage
  units: 'ip' | 'si'
  cfm50: number
  ach50: number
  cfm50PerEnclosureArea: number | null
  limits: { summary: string, citation: string }[]
  jurisdictionName: string
  edition: string | null
  ruleSetVersion: { id: number, number: number } | null
  decidedAt: string
  decidedByName: string
  raterName: string
}

export interface FilingDetail {
  id: number
  status: FilingState
  version: number
  revision: number
  raterId: number
  raterName: string
  reviewerName: string | null
  jurisdiction: { id: number, name: string }
  projectId: number
  testId: number
  returnReason: string | null
  submittedAt: string | null
  decidedAt: string | null
  /** The current revision as filed (null for a draft never filed). */
  snapshot: FilingSnapshot | null
  /** The check stored when this revision was filed. */
  filedCheck: CheckResponse | null
  /** Tightwell's recomputation now, from the filed readings, under the rules in force on the permit date. */
  recheck: CheckResponse | null
  /** Stated values against the recomputation. */
  stated: StatedComparison[]
  /** Where the filed check and the recomputation now disagree. */
  differences: string[]
  revisions: RevisionInfo[]
  transitions: TransitionInfo[]
  comments: CommentInfo[]
  files: UploadInfo[]
  certificate: CertificateInfo | null
  /** What the signed-in user may do now. */
  can: { submit: boolean, takeUp: boolean, decide: boolean, comment: boolean }
}

export interface VerifyResult {
  status: 'accepted'
  address: string
  result: { cfm50: number, ach50: number }
  decisionDate: string
}

export interface OutboxRow {
  id: number
  kind: MailKind
  to: string
  subject: string
  text: string
  status: MailStatus
  attempts: number
  lastError: string | null
  createdAt: string
  nextAttemptAt: string
  sentAt: string | null
  filingId: number | null
  /** What the local capture server received for it (demo and tests), raw RFC 5322. */
  captured: { receivedAt: string, envelopeTo: string[], raw: string } | null
}
