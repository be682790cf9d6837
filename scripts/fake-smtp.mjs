// Runs the fake SMTP server as its own process: node scripts/fake-smtp.mjs <port> <dir>
import { startFakeSmtp } from './lib/fake-smtp.mjs'

const [port = '2525', dir = '.data/mailbox'] = process.argv.slice(2)
const smtp = await startFakeSmtp({ port: Number(port), dir })
console.log(`fake SMTP listening on 127.0.0.1:${smtp.port}, storing mail in ${dir}`)
process.send?.({ ready: true, port: smtp.port })
const stop = () => smtp.close().then(() => process.exit(0))
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
