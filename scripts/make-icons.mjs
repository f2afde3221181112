// Renders the app icons (public/icon-192.png, public/icon-512.png) from public/icon.svg, the mark of
// docs/look.md in snow on ink with room around it for launchers that crop icons to a circle.
// Run: node scripts/make-icons.mjs (uses Debian's Chromium through playwright-core).
import { readFile } from 'node:fs/promises'
import { resolve } from 'node:path'
import { chromium } from 'playwright-core'

const root = resolve(import.meta.dirname, '..')
const svg = await readFile(resolve(root, 'public/icon.svg'), 'utf8')
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--headless', '--no-sandbox', '--disable-gpu'] })
for (const size of [192, 512]) {
  const page = await browser.newPage({ viewport: { width: size, height: size } })
  await page.setContent(`<html><body style="margin:0">${svg.replace('<svg ', `<svg width="${size}" height="${size}" `)}</body></html>`)
  await page.screenshot({ path: resolve(root, `public/icon-${size}.png`), omitBackground: false })
  await page.close()
}
await browser.close()
