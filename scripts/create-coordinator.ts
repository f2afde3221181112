// `npm run create-coordinator -- <email> "<name>"` with the password in GLOAMLINE_PASSWORD: the
// first coordinator of a real deployment (no demo seed). Refuses an e-mail already in use.
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { eq } from 'drizzle-orm'
import { people } from '../server/db/schema'
import { applyMigrations, openDatabase } from '../server/utils/db'
import { findPasswordProblem } from '../server/core/accounts/password-policy'

const [email, name] = process.argv.slice(2)
const password = process.env.GLOAMLINE_PASSWORD ?? ''
if (!email || !name || !/^[^@\s]+@[^@\s]+$/.test(email)) {
  console.error('usage: GLOAMLINE_PASSWORD=… npm run create-coordinator -- <email> "<name>"')
  process.exit(2)
}
const problem = findPasswordProblem(password, email)
if (problem) {
  console.error(`GLOAMLINE_PASSWORD ${problem}`)
  process.exit(2)
}
const db = openDatabase(process.env.DATABASE_PATH || '.data/gloamline.sqlite')
applyMigrations(db)
const address = email.trim().toLowerCase()
if (db.select().from(people).where(eq(people.email, address)).get()) {
  console.error(`${address} is already in use`)
  process.exit(1)
}
// the same scrypt settings as the server's password helpers (nuxt-auth-utils defaults)
const passwordHash = await new Hash(new Scrypt({})).make(password)
const row = db.insert(people).values({ email: address, name: name.trim(), role: 'coordinator', passwordHash }).returning().get()
console.info(`coordinator ${row.email} created (id ${row.id})`)
