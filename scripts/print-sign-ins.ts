// Prints the demo sign-ins after `npm run demo` has seeded.
import { DEMO_PASSWORD, DEMO_SIGN_INS } from './seed/sign-ins'

console.log('\nDemo sign-ins (password for all: %s)', DEMO_PASSWORD)
for (const s of DEMO_SIGN_INS) console.log(`  ${s.email.padEnd(32)} ${s.role.padEnd(16)} ${s.site}`)
console.log('')
