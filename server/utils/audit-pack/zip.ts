import { Zip, ZipDeflate, ZipPassThrough, strToU8 } from 'fflate'

// The audit pack's ZIP, written as it goes (fflate's streaming Zip): each CSV is deflated a batch of rows
// at a time, certificates (already compressed PDFs and images) are stored as they are.

export class PackZip {
  private readonly chunks: Uint8Array[] = []
  private failure: Error | null = null
  private readonly zip = new Zip((error, data) => {
    if (error) this.failure = error
    else this.chunks.push(data)
  })

  private readonly names = new Set<string>()

  /** A file name not used yet in the ZIP ("a.pdf", then "a (2).pdf"). */
  uniqueName(name: string): string {
    let candidate = name
    for (let n = 2; this.names.has(candidate); n++) candidate = name.replace(/(\.[^./]+)?$/, ext => ` (${n})${ext}`)
    this.names.add(candidate)
    return candidate
  }

  /** A deflated text file: push its parts, then end it. */
  textFile(name: string) {
    const file = new ZipDeflate(this.uniqueName(name), { level: 6 })
    this.zip.add(file)
    return {
      push: (text: string) => file.push(strToU8(text), false),
      end: () => file.push(new Uint8Array(0), true),
    }
  }

  storedFile(name: string, bytes: Uint8Array) {
    const file = new ZipPassThrough(this.uniqueName(name))
    this.zip.add(file)
    file.push(bytes, true)
  }

  finish(): Uint8Array {
    this.zip.end()
    if (this.failure) throw this.failure
    const out = new Uint8Array(this.chunks.reduce((n, c) => n + c.length, 0))
    let at = 0
    for (const c of this.chunks) {
      out.set(c, at)
      at += c.length
    }
    return out
  }
}

/** A certificate's name in the ZIP: its day, its truck and its own name, without path characters. */
export function certificateFileName(testedOn: string, truck: string, displayName: string): string {
  const safe = (s: string) => s.split('').filter(ch => ch >= ' ').join('').replace(/[\\/:*?"<>|]+/g, '_').replace(/^\.+/, '').trim().slice(0, 120)
  return `certificates/${safe(`${testedOn} ${truck} ${displayName}`) || 'certificate'}`
}
