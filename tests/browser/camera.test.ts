import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import QRCode from 'qrcode'
import { chromium, type Browser } from 'playwright-core'
import { builtServer } from '../support/http'
import { area, battery, closeTestDb, site, user } from '../support/db'
import { CHROMIUM_ARGS, PHONE, signInAt } from '../support/chromium'
import { fittedTruck, putInTruck, qualify, tagFor } from '../support/battery-room'

await setup(builtServer)

// The camera, end to end: Chromium's fake camera plays a video of a truck's QR label (made here with the qrcode
// package, as the label sheet makes it) and the app decodes it from the camera's frames (jsQR, as on a phone
// without the browser's barcode detector).

/** A YUV4MPEG2 video (4:2:0) of the QR symbol of `text`, black modules on white with a quiet zone: Chromium's
 * file-backed fake camera reads this format. */
function qrVideo(text: string, side = 480, frames = 10): Buffer {
  const qr = QRCode.create(text, { errorCorrectionLevel: 'M' })
  const n = qr.modules.size
  const cell = Math.floor(side / (n + 8))
  const offset = Math.floor((side - cell * n) / 2)
  const y = Buffer.alloc(side * side, 235)
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      if (!qr.modules.get(r, c)) continue
      for (let dy = 0; dy < cell; dy++) y.fill(16, (offset + r * cell + dy) * side + offset + c * cell, (offset + r * cell + dy) * side + offset + (c + 1) * cell)
    }
  }
  const chroma = Buffer.alloc((side / 2) * (side / 2) * 2, 128)
  const frame = Buffer.concat([Buffer.from('FRAME\n'), y, chroma])
  return Buffer.concat([Buffer.from(`YUV4MPEG2 W${side} H${side} F10:1 Ip A1:1 C420jpeg\n`), ...Array.from({ length: frames }, () => frame)])
}

let browser: Browser
let siteId: string
let operator: { id: string, email: string, password: string }
let truckCode: string
let outSerial: string

beforeAll(async () => {
  siteId = (await site({ name: `Camera site ${Date.now()}` })).id
  const areaId = (await area({ siteId, name: `Charge room ${Date.now()}` })).id
  operator = await user({ siteId, roles: ['operator'], name: 'Camera Operator' })
  await qualify(operator.id)
  const truck = await fittedTruck(siteId, { hourMeter: 800 })
  const out = await battery({ siteId, homeAreaId: areaId })
  await putInTruck(out.id, truck.id)
  outSerial = out.serial
  truckCode = (await tagFor('truck', truck.id, siteId))!
  const video = join(mkdtempSync(join(tmpdir(), 'bayward-camera-')), 'tag.y4m')
  writeFileSync(video, qrVideo(`${process.env.NUXT_PUBLIC_BASE_URL ?? 'http://localhost:3000'}/t/${truckCode}`))
  browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [...CHROMIUM_ARGS, '--use-fake-ui-for-media-stream', '--use-fake-device-for-media-stream', `--use-file-for-fake-video-capture=${video}`],
  })
})
afterAll(async () => {
  await browser?.close()
  await closeTestDb()
})

describe('scanning a tag with the camera (phone width)', () => {
  it('on the battery change form, the camera button beside a code field reads the truck\'s label into it and the form goes on', async () => {
    const { context, page } = await signInAt(browser, operator, '/swap', PHONE)
    await context.grantPermissions(['camera'])
    const truckField = page.getByLabel('1 · Truck', { exact: true })
    await truckField.waitFor()
    const cameraButton = page.getByRole('button', { name: 'Scan the tag with the camera' }).first()
    await cameraButton.click()
    // leaving the empty field for its camera is not a look-up: no "scan or type the code" under it
    await expect.poll(() => page.getByText('Scan or type the code.').count()).toBe(0)
    await expect.poll(() => truckField.inputValue(), { timeout: 15_000 }).toBe(truckCode)
    // the truck is looked up as if typed: the form says which battery it holds, and the camera has closed
    await expect.poll(() => page.getByText(outSerial).count()).toBeGreaterThan(0)
    await expect.poll(() => page.getByLabel('Camera view: hold the tag inside the frame').count()).toBe(0)
    await context.close()
  })

  it('the camera can be closed without reading anything, and the field stays as it was', async () => {
    const again = await signInAt(browser, operator, '/swap', PHONE)
    await again.page.getByLabel('1 · Truck', { exact: true }).waitFor()
    await again.page.getByRole('button', { name: 'Scan the tag with the camera' }).first().click()
    await again.page.getByRole('button', { name: 'Close the camera' }).click()
    await expect.poll(() => again.page.getByRole('button', { name: 'Close the camera' }).count()).toBe(0)
    expect(await again.page.getByLabel('1 · Truck', { exact: true }).inputValue()).toBe('')
    await again.context.close()
  })

  it('the Scan page\'s camera opens the tag page of the label it reads', async () => {
    const { context, page } = await signInAt(browser, operator, '/scan', PHONE)
    await page.getByRole('button', { name: 'Scan with camera' }).click()
    await page.waitForURL(new RegExp(`/t/${truckCode}$`), { timeout: 15_000 })
    await context.close()
  })
})
