// Shared steps of `npm start` and `npm test`: dependencies, secrets, migrations, build.
import { spawnSync } from 'node:child_process'
import { createHash, randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs'
import { dirname, join, relative, resolve } from 'node:path'

export const root = resolve(dirname(new URL(import.meta.url).pathname), '..', '..')

export function step(message) {
  console.log(`\n▸ ${message}`)
}

/** Runs a command in the project folder, inheriting output; returns its exit code. */
export function run(command, args, env = {}) {
  const result = spawnSync(command, args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } })
  return result.status ?? 1
}

export function mustRun(command, args, env = {}) {
  const code = run(command, args, env)
  if (code !== 0) {
    console.error(`\n✗ ${command} ${args.join(' ')} failed with exit code ${code}`)
    process.exit(code)
  }
}

/** Installs packages from the lockfile when node_modules is missing or older than the lockfile. */
export function ensureDependencies() {
  const marker = join(root, 'node_modules', '.package-lock.json')
  const lock = join(root, 'package-lock.json')
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return
  step('installing dependencies (npm ci)')
  mustRun('npm', ['ci', '--no-audit', '--no-fund'])
}

/** Installs a Debian package when the file it provides is missing. */
function ensureDebianPackage(file, name, why) {
  if (existsSync(file)) return
  step(`installing ${name} from Debian packages (${why})`)
  const apt = ['-o', 'DPkg::Lock::Timeout=300']
  mustRun('apt-get', [...apt, 'update', '-qq'])
  mustRun('apt-get', [...apt, 'install', '-y', '-qq', '--no-install-recommends', name], { DEBIAN_FRONTEND: 'noninteractive' })
}

/** Debian's Chromium for the browser tests. */
export function ensureChromium() {
  ensureDebianPackage('/usr/bin/chromium', 'chromium', 'browser tests')
}

/** poppler-utils, whose pdftoppm and pdftotext read the printed pages back in the print test. */
export function ensurePoppler() {
  ensureDebianPackage('/usr/bin/pdftoppm', 'poppler-utils', 'print tests')
}

/** A session password kept in .data/ so that sign-ins survive a restart; never committed. */
export function localSessionPassword() {
  if (process.env.NUXT_SESSION_PASSWORD) return process.env.NUXT_SESSION_PASSWORD
  const file = join(root, '.data', 'session-password')
  mkdirSync(dirname(file), { recursive: true })
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString('hex'), { mode: 0o600 })
  return readFileSync(file, 'utf8').trim()
}

/** Migrates as the schema's owner (`ownerUrl`), then gives the app's role (`appUrl`) what it may use. */
export function migrate(ownerUrl, appUrl) {
  step('migrating the database')
  mustRun(join(root, 'node_modules', '.bin', 'tsx'), ['server/cli/migrate.ts'], { NUXT_DATABASE_OWNER_URL: ownerUrl, NUXT_DATABASE_URL: appUrl })
}

const BUILD_INPUTS = ['app', 'server', 'shared', 'content', 'nuxt.config.ts', 'tailwind.config.ts', 'package-lock.json']

function sourceFingerprint() {
  const hash = createHash('sha256')
  const visit = (path) => {
    if (!existsSync(path)) return
    const stat = statSync(path)
    if (stat.isDirectory()) {
      for (const name of readdirSync(path).sort()) visit(join(path, name))
      return
    }
    hash.update(relative(root, path)).update('\0').update(readFileSync(path)).update('\0')
  }
  for (const input of BUILD_INPUTS) visit(join(root, input))
  return hash.digest('hex')
}

/** Builds the app when .output is missing or was built from other sources. */
export function buildIfStale() {
  const stamp = join(root, '.output', '.source-fingerprint')
  const fingerprint = sourceFingerprint()
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === fingerprint) return
  step('building the app (nuxt build)')
  mustRun(join(root, 'node_modules', '.bin', 'nuxt'), ['build'])
  writeFileSync(stamp, fingerprint)
}

/** Waits until the server answers, or fails after `seconds`. */
export async function waitForServer(url, seconds = 60) {
  const until = Date.now() + seconds * 1000
  while (Date.now() < until) {
    try {
      const response = await fetch(`${url}/api/health`)
      if (response.ok) return
    }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error(`the server did not answer at ${url} within ${seconds} s`)
}
