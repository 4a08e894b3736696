type Decoder = (frame: ImageData | HTMLVideoElement) => Promise<string | null>

// Camera preview with live QR decoding: the browser's BarcodeDetector where it exists, otherwise
// jsQR bundled with the app (loaded only then). Calls onCode with the first tag code it reads.
export function useTagScanner(video: Ref<HTMLVideoElement | null>, onCode: (code: string) => void) {
  const state = ref<'idle' | 'starting' | 'scanning' | 'denied' | 'no-camera' | 'unsupported'>('idle')
  const torchAvailable = ref(false)
  const torchOn = ref(false)
  let stream: MediaStream | null = null
  let running = false
  const canvas = import.meta.client ? document.createElement('canvas') : null

  async function decoder(): Promise<Decoder> {
    const Native = (globalThis as { BarcodeDetector?: new (o: { formats: string[] }) => { detect: (s: unknown) => Promise<{ rawValue: string }[]> } }).BarcodeDetector
    if (Native) {
      const detector = new Native({ formats: ['qr_code'] })
      return async frame => (await detector.detect(frame))[0]?.rawValue ?? null
    }
    const { default: jsQR } = await import('jsqr')
    return async (frame) => {
      if (!(frame instanceof ImageData)) return null
      return jsQR(frame.data, frame.width, frame.height, { inversionAttempts: 'attemptBoth' })?.data ?? null
    }
  }

  function grab(v: HTMLVideoElement): ImageData | null {
    if (!canvas || !v.videoWidth) return null
    const scale = Math.min(1, 640 / v.videoWidth)
    canvas.width = Math.round(v.videoWidth * scale)
    canvas.height = Math.round(v.videoHeight * scale)
    const ctx = canvas.getContext('2d', { willReadFrequently: true })!
    ctx.drawImage(v, 0, 0, canvas.width, canvas.height)
    return ctx.getImageData(0, 0, canvas.width, canvas.height)
  }

  async function start() {
    if (!navigator.mediaDevices?.getUserMedia) {
      state.value = 'unsupported'
      return
    }
    state.value = 'starting'
    try {
      stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: { ideal: 'environment' } }, audio: false })
    }
    catch (error) {
      const name = (error as { name?: string }).name
      state.value = name === 'NotAllowedError' || name === 'SecurityError' ? 'denied' : 'no-camera'
      return
    }
    const track = stream.getVideoTracks()[0]
    torchAvailable.value = !!(track?.getCapabilities?.() as { torch?: boolean } | undefined)?.torch
    video.value!.srcObject = stream
    await video.value!.play()
    state.value = 'scanning'
    running = true
    const decode = await decoder()
    const native = !!(globalThis as { BarcodeDetector?: unknown }).BarcodeDetector
    while (running) {
      const v = video.value
      const frame = v && (native ? v : grab(v))
      const text = frame ? await decode(frame).catch(() => null) : null
      const code = text ? normalizeTagCode(text) : null
      if (code) {
        stop()
        onCode(code)
        return
      }
      await new Promise(resolve => setTimeout(resolve, 150))
    }
  }

  async function toggleTorch() {
    const track = stream?.getVideoTracks()[0]
    if (!track) return
    torchOn.value = !torchOn.value
    await track.applyConstraints({ advanced: [{ torch: torchOn.value } as MediaTrackConstraintSet] }).catch(() => {
      torchOn.value = false
    })
  }

  function stop() {
    running = false
    stream?.getTracks().forEach(t => t.stop())
    stream = null
    if (state.value === 'scanning' || state.value === 'starting') state.value = 'idle'
  }

  onBeforeUnmount(stop)
  return { state, torchAvailable, torchOn, start, stop, toggleTorch }
}
