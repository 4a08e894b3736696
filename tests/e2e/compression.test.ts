import { request } from 'node:http'
import { readdirSync } from 'node:fs'
import { brotliDecompressSync, gunzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup, url } from '@nuxt/test-utils/e2e'
import { builtServer, signIn, type Client } from '../support/http'
import { battery, closeTestDb, site, user } from '../support/db'

await setup(builtServer)

interface Raw { status: number, headers: Record<string, string | string[] | undefined>, body: Buffer }

// A plain HTTP GET that shows the bytes on the wire (fetch would undo the compression).
function rawGet(path: string, headers: Record<string, string>): Promise<Raw> {
  return new Promise((resolve, reject) => {
    const req = request(url(path), { headers }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }))
    })
    req.on('error', reject)
    req.end()
  })
}

let lead: Client
let siteId: string

beforeAll(async () => {
  siteId = (await site()).id
  for (let i = 0; i < 15; i++) await battery({ siteId })
  lead = await signIn(await user({ siteId, roles: ['facilities_lead'] }))
})
afterAll(() => closeTestDb())

describe('small on the wire', () => {
  it('a JSON answer above the threshold goes brotli or gzip as asked, and decodes to the same JSON', async () => {
    const path = `/api/batteries?siteId=${siteId}&pageSize=50`
    const plain = await rawGet(path, { 'cookie': lead.cookie!, 'accept-encoding': 'identity' })
    expect(plain.status).toBe(200)
    expect(plain.headers['content-encoding']).toBeUndefined()
    expect(plain.body.length).toBeGreaterThan(1024)
    const br = await rawGet(path, { 'cookie': lead.cookie!, 'accept-encoding': 'br, gzip' })
    expect(br.headers['content-encoding']).toBe('br')
    expect(br.headers.vary).toMatch(/accept-encoding/i)
    expect(br.body.length).toBeLessThan(plain.body.length / 2)
    expect(JSON.parse(brotliDecompressSync(br.body).toString())).toEqual(JSON.parse(plain.body.toString()))
    const gz = await rawGet(path, { 'cookie': lead.cookie!, 'accept-encoding': 'gzip' })
    expect(gz.headers['content-encoding']).toBe('gzip')
    expect(JSON.parse(gunzipSync(gz.body).toString())).toEqual(JSON.parse(plain.body.toString()))
  })

  it('a small JSON answer and a CSV export go as they are', async () => {
    const health = await rawGet('/api/health', { 'accept-encoding': 'br, gzip' })
    expect(health.headers['content-encoding']).toBeUndefined()
    expect(JSON.parse(health.body.toString())).toEqual({ ok: true })
    const csv = await rawGet(`/api/batteries/export?siteId=${siteId}`, { 'cookie': lead.cookie!, 'accept-encoding': 'br, gzip' })
    expect(csv.status).toBe(200)
    expect(csv.headers['content-encoding']).toBeUndefined()
  })

  it('the app\'s scripts are served from the files written brotli and gzip at build', async () => {
    const dir = `${builtServer.nuxtConfig.nitro.output.dir}/public/_nuxt`
    const script = readdirSync(dir).find(f => f.endsWith('.js.br'))!.replace(/\.br$/, '')
    const plain = await rawGet(`/_nuxt/${script}`, { 'accept-encoding': 'identity' })
    const br = await rawGet(`/_nuxt/${script}`, { 'accept-encoding': 'br, gzip' })
    expect(br.headers['content-encoding']).toBe('br')
    expect(brotliDecompressSync(br.body)).toEqual(plain.body)
    const gz = await rawGet(`/_nuxt/${script}`, { 'accept-encoding': 'gzip' })
    expect(gz.headers['content-encoding']).toBe('gzip')
    expect(gunzipSync(gz.body)).toEqual(plain.body)
  })
})
