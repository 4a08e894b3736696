import QRCode from 'qrcode'

// Error-correction level H restores up to about 30 % of a damaged symbol (ISO/IEC 18004), the most
// forgiving level for dirty, scratched labels in a battery room.
export const QR_ERROR_CORRECTION = 'H' as const

export function tagUrlFor(code: string): string {
  return tagUrl(useRuntimeConfig().public.baseUrl as string, code)
}

export function qrMatrix(text: string): { size: number, dark: (x: number, y: number) => boolean } {
  const qr = QRCode.create(text, { errorCorrectionLevel: QR_ERROR_CORRECTION })
  const { size, data } = qr.modules
  return { size, dark: (x, y) => !!data[y * size + x] }
}

export function qrSvg(text: string): Promise<string> {
  return QRCode.toString(text, { type: 'svg', errorCorrectionLevel: QR_ERROR_CORRECTION, margin: 4 })
}

export function qrPng(text: string, scale = 8): Promise<Buffer> {
  return QRCode.toBuffer(text, { type: 'png', errorCorrectionLevel: QR_ERROR_CORRECTION, margin: 4, scale })
}
