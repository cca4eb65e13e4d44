/**
 * The demo's invented public-spending ledger: the payments of an invented city, Port Averly,
 * to invented suppliers over one year. One supplier's invoices bunch just under the approval
 * limit — the planted anomaly the demo investigation finds. No real people, firms or figures.
 */
import { seededRandom } from './seeded-random'

export const APPROVAL_LIMIT = 25_000
export const PLANTED_VENDOR = 'Quillmere Facilities Ltd'

const DEPARTMENTS = ['Roads and Bridges', 'Parks and Harbour', 'Schools Estate', 'Social Care', 'Waste Services', 'Libraries', 'City Hall Operations', 'Housing Repairs']
const VENDORS = [
  'Averly Asphalt Co', 'Brightwater Catering', 'Cinderfield Print House', 'Dunmore Fleet Hire', 'Elmstead Cleaning Group', 'Fairlow IT Services',
  'Gannet Bay Joinery', 'Halden & Pike Surveyors', 'Ironbridge Waste Haulage', 'Juniper Lane Care', 'Kestrel Office Supply', 'Larkhill Landscaping',
  'Marrow Street Legal', 'Northcove Electrical', 'Oakhurst Playground Works', 'Pellham Security', 'Redfern Scaffolding', 'Saltmarsh Consulting',
  'Tidewell Plumbing', 'Umber Signage', 'Vantry Glass & Glazing', 'Westquay Transport', 'Yarrow Meals on Wheels', 'Zephyr Heating Ltd',
]
const ITEMS = ['Maintenance works', 'Supplies', 'Consultancy', 'Repairs', 'Equipment hire', 'Service contract', 'Cleaning', 'Transport']

const money = new Intl.NumberFormat('en-GB', { minimumFractionDigits: 2, maximumFractionDigits: 2 })

function csvCell(text: string) {
  return /[",\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text
}

/** The ledger as CSV text: about `rows` payments plus the planted supplier's, in date order. */
export function demoLedgerCsv(rows = 24_000): string {
  const next = seededRandom(20260301)
  const payments: { day: number, vendor: string, amount: number }[] = []
  const add = (vendor: string, amount: number) => payments.push({ day: Math.floor(next() * 365), vendor, amount })
  for (let i = 0; i < rows; i++) {
    // Log-uniform over four whole orders of magnitude (about 32 to 316,000): the shape the digit law describes.
    const amount = Math.round(10 ** (1.5 + 4 * next()) * 100) / 100
    add(VENDORS[Math.floor(next() * VENDORS.length)]!, amount)
  }
  // The planted supplier: ordinary invoices, plus many just under the approval limit.
  for (let i = 0; i < 260; i++) add(PLANTED_VENDOR, Math.round(10 ** (2 + next() * 2.6) * 100) / 100)
  for (let i = 0; i < 340; i++) add(PLANTED_VENDOR, Math.round((APPROVAL_LIMIT - 20 - next() * 1_150) * 100) / 100)
  payments.sort((a, b) => a.day - b.day)

  const lines = ['payment_ref,paid_on,department,supplier,description,amount']
  let ref = 100_000
  for (const payment of payments) {
    ref += 1 + Math.floor(next() * 3)
    const paidOn = new Date(Date.UTC(2025, 0, 1) + payment.day * 86_400_000).toISOString().slice(0, 10)
    const department = DEPARTMENTS[Math.floor(next() * DEPARTMENTS.length)]!
    const item = ITEMS[Math.floor(next() * ITEMS.length)]!
    lines.push([`PAY-${ref}`, paidOn, department, payment.vendor, item, money.format(payment.amount)].map(csvCell).join(','))
  }
  return `${lines.join('\n')}\n`
}
