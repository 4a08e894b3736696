// CPU time of a process and of every PostgreSQL process, from /proc (user + system), for the CPU probes.
import { readFileSync, readdirSync } from 'node:fs'

const TICK_MS = 10 // USER_HZ = 100 on Linux

export const cpuMs = (pid: number | string) => {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')
    return (Number(fields[11]) + Number(fields[12])) * TICK_MS
  }
  catch {
    return 0
  }
}

const postgresPids = () => readdirSync('/proc').filter(p => /^\d+$/.test(p)).filter((p) => {
  try {
    return readFileSync(`/proc/${p}/cmdline`, 'utf8').startsWith('postgres')
  }
  catch {
    return false
  }
})

export const pgCpuMs = () => postgresPids().reduce((n, p) => n + cpuMs(p), 0)
