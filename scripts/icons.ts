// `npm run icons`: draws public/icons/bayward.svg into the PNG sizes the web manifest and iOS ask for,
// with the project's own Chromium (playwright-core). The PNGs are committed; run this after changing the SVG.
import { readFileSync, writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { chromium } from 'playwright-core'
import { CHROMIUM_ARGS } from '../tests/support/chromium'

const dir = fileURLToPath(new URL('../public/icons/', import.meta.url))
const svg = readFileSync(`${dir}bayward.svg`, 'utf8')
// maskable: the whole square is painted, and the drawing sits inside the central safe circle (80 %)
const SIZES: { file: string, size: number, scale: number }[] = [
  { file: 'bayward-192.png', size: 192, scale: 1 },
  { file: 'bayward-512.png', size: 512, scale: 1 },
  { file: 'bayward-maskable-512.png', size: 512, scale: 0.8 },
  { file: 'apple-touch-icon.png', size: 180, scale: 1 },
]

const browser = await chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: CHROMIUM_ARGS })
const page = await browser.newPage()
for (const { file, size, scale } of SIZES) {
  await page.setViewportSize({ width: size, height: size })
  const inner = Math.round(size * scale)
  const pad = (size - inner) / 2
  await page.setContent(`<html><body style="margin:0;background:#1e293b"><div style="padding:${pad}px;width:${inner}px;height:${inner}px">${svg.replace('<svg ', `<svg width="${inner}" height="${inner}" `)}</div></body></html>`)
  writeFileSync(`${dir}${file}`, await page.screenshot({ omitBackground: false }))
  console.log(`public/icons/${file} (${size}×${size})`)
}
await browser.close()
