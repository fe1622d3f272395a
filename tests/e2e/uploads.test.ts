import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, freshAddress } from '../support/http'
import { JPEG, PDF, PNG, projectBody, testBody } from '../support/filing'
import { freePort, startBuiltServer, type RunningServer } from '../support/server'

// Uploads are typed by their first bytes, capped at 20 MB (413 naming the limit), stored under
// generated keys and served with a content type and disposition of our own choosing.
let rater: Client
let testId: number

beforeAll(async () => {
  rater = new Client(undefined, freshAddress())
  await rater.signIn('rater@tightwell.test')
  const project = await rater.post('/api/projects', projectBody())
  testId = (await rater.post(`/api/projects/${project.body.id}/tests`, testBody())).body.id
})

describe('upload attacks', () => {
  it('wrong magic bytes: a text file named .jpg, an executable named .pdf, a PNG sent as readings → 415', async () => {
    const fake = await rater.upload(`/api/tests/${testId}/uploads`, 'just text, not a picture', 'holiday.jpg', 'image/jpeg')
    expect(fake.status).toBe(415)
    expect(fake.body.message).toBe('file: is not a JPEG, PNG, PDF file by its content (the name does not decide)')
    expect(fake.body.data.field).toBe('file')
    expect((await rater.upload(`/api/tests/${testId}/uploads`, Uint8Array.from([0x4D, 0x5A, 0x90, 0x00, 0x03]), 'report.pdf', 'application/pdf')).status).toBe(415)
    const pngAsCsv = await rater.upload(`/api/tests/${testId}/readings-file`, PNG, 'readings.csv', 'text/csv')
    expect(pngAsCsv.status).toBe(415)
    expect(pngAsCsv.body.message).toContain('CSV (UTF-8 text)')
    expect((await rater.upload(`/api/tests/${testId}/readings-file`, Uint8Array.from([0x50, 0x2C, 0x00, 0x51]), 'nul.csv', 'text/csv')).status).toBe(415)
  })

  it('oversize: 413 with the limit in the message, and nothing stored', async () => {
    const before = (await rater.get(`/api/tests/${testId}`)).body.uploads.length
    const big = new Uint8Array(21 * 1024 * 1024)
    big.set(PNG)
    const res = await rater.upload(`/api/tests/${testId}/uploads`, big, 'huge.png', 'image/png')
    expect(res.status).toBe(413)
    expect(res.body.message).toContain('limit of 20 MB (20971520 bytes)')
    expect(res.body.data.limitBytes).toBe(20 * 1024 * 1024)
    expect((await rater.get(`/api/tests/${testId}`)).body.uploads).toHaveLength(before)
  })

  it('path-like names are reduced to their last segment; the storage key is ours', async () => {
    const cases: [string, Uint8Array, string][] = [
      ['../../../../etc/passwd.png', PNG, 'passwd.png'],
      ['C:\\Windows\\System32\\evil.pdf', PDF, 'evil.pdf'],
      ['..\\..\\.ssh\\id.jpg', JPEG, 'id.jpg'],
      ['....', PNG, 'file.png'],
    ]
    for (const [name, bytes, shown] of cases) {
      const res = await rater.upload(`/api/tests/${testId}/uploads`, bytes, name)
      expect(res.status, name).toBe(201)
      expect(res.body.name).toBe(shown)
      expect(JSON.stringify(res.body)).not.toContain('..')
      expect(res.body).not.toHaveProperty('storageKey')
      const back = await rater.bytes(res.body.url)
      expect(back.status).toBe(200)
      expect(Buffer.from(back.bytes).equals(Buffer.from(bytes))).toBe(true)
      expect(back.headers.get('content-disposition')).toContain(`filename="${shown}"`)
    }
  })

  it('an empty file, a missing field and a JSON body → 400 naming "file"', async () => {
    const empty = await rater.upload(`/api/tests/${testId}/uploads`, new Uint8Array(0), 'empty.png', 'image/png')
    expect(empty.status).toBe(400)
    expect(empty.body.message).toBe('file: is empty')
    const wrongField = await rater.upload(`/api/tests/${testId}/uploads`, PNG, 'a.png', 'image/png', 'photo')
    expect(wrongField.status).toBe(400)
    expect(wrongField.body.data.field).toBe('file')
    const json = await rater.post(`/api/tests/${testId}/uploads`, { file: 'iVBORw0KGgo=' })
    expect(json.status).toBe(400)
    expect(json.body.message).toContain('multipart/form-data')
    const emptyCsv = await rater.upload(`/api/tests/${testId}/readings-file`, new Uint8Array(0), 'r.csv', 'text/csv')
    expect(emptyCsv.body.message).toBe('file: is empty')
  })

  it('serves with a safe type and disposition: photos inline, PDFs and CSVs as attachments, nosniff, sandboxed', async () => {
    const png = await rater.upload(`/api/tests/${testId}/uploads`, PNG, 'Façade été.png', 'text/html')
    expect(png.body.contentType).toBe('image/png')
    const res = await rater.bytes(png.body.url)
    expect(res.headers.get('content-type')).toBe('image/png')
    expect(res.headers.get('content-disposition')).toBe('inline; filename="Fa_ade _t_.png"; filename*=UTF-8\'\'Fa%C3%A7ade%20%C3%A9t%C3%A9.png')
    expect(res.headers.get('x-content-type-options')).toBe('nosniff')
    expect(res.headers.get('content-security-policy')).toContain('sandbox')
    const pdf = await rater.upload(`/api/tests/${testId}/uploads`, PDF, 'report.pdf', 'image/png')
    const pdfRes = await rater.bytes(pdf.body.url)
    expect(pdfRes.headers.get('content-type')).toBe('application/pdf')
    expect(pdfRes.headers.get('content-disposition')).toMatch(/^attachment; filename="report.pdf"/)
  })
})

describe('the S3 driver against a local fake S3 server (s3rver, loopback)', () => {
  let server: RunningServer | undefined
  let s3: { close: () => Promise<void> } | undefined
  let dir = ''
  afterAll(async () => {
    await server?.stop()
    await s3?.close()
    if (dir) rmSync(dir, { recursive: true, force: true })
  })

  it('stores and serves an upload through TIGHTWELL_STORAGE=s3', async () => {
    const { default: S3rver } = await import('s3rver')
    dir = mkdtempSync(join(tmpdir(), 'tightwell-s3-'))
    const port = await freePort()
    const fake = new S3rver({ port, address: '127.0.0.1', directory: dir, silent: true, configureBuckets: [{ name: 'tightwell-uploads', configs: [] }] })
    await fake.run()
    s3 = fake
    server = await startBuiltServer({
      TIGHTWELL_STORAGE: 's3',
      TIGHTWELL_S3_ENDPOINT: `http://127.0.0.1:${port}`,
      TIGHTWELL_S3_BUCKET: 'tightwell-uploads',
      TIGHTWELL_S3_REGION: 'us-east-1',
      TIGHTWELL_S3_ACCESS_KEY_ID: 'S3RVER',
      TIGHTWELL_S3_SECRET_ACCESS_KEY: 'S3RVER',
    })
    expect(server.output()).toContain(`uploads stored in s3 http://127.0.0.1:${port}/tightwell-uploads`)
    const client = new Client(server.url, freshAddress())
    await client.signIn('rater@tightwell.test')
    const project = await client.post('/api/projects', projectBody())
    const test = await client.post(`/api/projects/${project.body.id}/tests`, testBody())
    const up = await client.upload(`/api/tests/${test.body.id}/uploads`, PNG, 'fan.png', 'image/png')
    expect(up.status).toBe(201)
    const back = await client.bytes(up.body.url)
    expect(back.status).toBe(200)
    expect(Buffer.from(back.bytes).equals(Buffer.from(PNG))).toBe(true)
    // The object is in the fake bucket (s3rver keeps one folder per object), not on the app's disk.
    const objects = readdirSync(join(dir, 'tightwell-uploads'), { recursive: true }).map(String)
    expect(objects.some(o => o.startsWith(`p${project.body.id}/`))).toBe(true)
    expect(() => statSync(join(server!.dataDir, '.data/uploads'))).toThrow()
    // CSV through the same driver: stored, read back for the import.
    const csv = await client.upload(`/api/tests/${test.body.id}/readings-file`, 'P,Q\n-50,900\n', 'r.csv', 'text/csv')
    const imported = await client.post(`/api/tests/${test.body.id}/readings-import`, { uploadId: csv.body.upload.id, pressureColumn: 0, flowColumn: 1, hasHeader: true })
    expect(imported.status).toBe(200)
    expect(imported.body.readings).toEqual([{ pressure: -50, flow: 900 }])
  })
})
