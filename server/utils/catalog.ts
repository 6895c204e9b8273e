// Catalog queries that the product, cart, quote and checkout routes share.
import { and, asc, eq, inArray, sql } from 'drizzle-orm'
import { batches, priceTiers, products } from '../database/schema'
import type { BatchView, ProductView } from '../../shared/types/shop'
import {
  priceCart,
  tierRangeLabel,
  type PriceTier,
  type TaxBasis,
} from '../../shared/utils/pricing'
import { unitsLeft } from '../../shared/utils/shop-rules'
import type { CartLine } from '../../shared/schemas/shop'

export type ProductRow = typeof products.$inferSelect

/** Products with their tiers and batches. */
export async function loadCatalog(
  db: DbOrTx,
  where: { activeOnly: boolean, ids?: number[], slug?: string },
) {
  const conds = [
    where.activeOnly ? eq(products.active, true) : undefined,
    where.ids ? (where.ids.length ? inArray(products.id, where.ids) : sql`false`) : undefined,
    where.slug ? eq(products.slug, where.slug) : undefined,
  ]
  const rows = await db
    .select()
    .from(products)
    .where(and(...conds))
    .orderBy(asc(products.sortOrder), asc(products.id))
  const ids = rows.map(r => r.id)
  const [tierRows, batchRows] = ids.length
    ? await Promise.all([
        db
          .select()
          .from(priceTiers)
          .where(inArray(priceTiers.productId, ids))
          .orderBy(asc(priceTiers.minQuantity)),
        db
          .select()
          .from(batches)
          .where(inArray(batches.productId, ids))
          .orderBy(asc(batches.builtOn), asc(batches.id)),
      ])
    : [[], []]
  return rows.map((p) => {
    const tiers: PriceTier[] = tierRows
      .filter(t => t.productId === p.id)
      .map(t => ({ minQuantity: t.minQuantity, unitPriceCents: t.unitPriceCents }))
    const bs: BatchView[] = batchRows
      .filter(b => b.productId === p.id)
      .map(b => ({
        id: b.id,
        code: b.code,
        quantityBuilt: b.quantityBuilt,
        left: unitsLeft(b),
        builtOn: b.builtOn.toISOString(),
      }))
    return { row: p, tiers, batches: bs, available: bs.reduce((s, b) => s + b.left, 0) }
  })
}

export type CatalogEntry = Awaited<ReturnType<typeof loadCatalog>>[number]

const activeCatalog = snapshots(() => loadCatalog(useDb(), { activeOnly: true }), { maxKeys: 1 })

/** The catalog on sale, the same for every visitor: from this instance's snapshot, at most
 *  SNAPSHOT_MAX_AGE_MS old (server/utils/snapshots.ts). For reads only; anything that prices,
 *  reserves or checks stock reads the database itself. */
export const publicCatalog = () => activeCatalog('all')

export function productView(e: CatalogEntry): ProductView {
  return {
    id: e.row.id,
    slug: e.row.slug,
    name: e.row.name,
    kind: e.row.kind,
    summary: e.row.summary,
    image: e.row.image,
    priceTiers: e.tiers,
    available: e.available,
    batches: e.batches.filter(b => b.left > 0),
    active: e.row.active,
  }
}

/** Prices cart lines from the catalog as it is now, taxed on `tax` (schoolTaxBasis). Unknown or
 *  withdrawn products come back in `missing`. */
export async function priceLines(db: DbOrTx, lines: CartLine[], tax: TaxBasis) {
  const catalog = await loadCatalog(db, { activeOnly: true, ids: lines.map(l => l.productId) })
  const byId = new Map(catalog.map(c => [c.row.id, c]))
  const known = lines.filter(l => byId.has(l.productId) && byId.get(l.productId)!.tiers.length)
  const missing = lines.filter(l => !known.includes(l)).map(l => l.productId)
  const priced = priceCart(
    known.map((l) => {
      const c = byId.get(l.productId)!
      return {
        productId: l.productId,
        name: c.row.name,
        quantity: l.quantity,
        tiers: c.tiers,
        weightGrams: c.row.weightGrams,
      }
    }),
    tax,
  )
  return { ...priced, missing, byId }
}

/** Stored quote and order lines with their tier's range in the kit page's words ("1–4"): the
 *  label kept with the line; for lines stored before labels were kept, from the product's tiers
 *  as they stand (a tier no longer in the catalog reads "12+"). */
type Labelled = { productId: number, tierMinQuantity: number, tierLabel?: string | null }
export async function withTierLabels<L extends Labelled>(
  db: DbOrTx,
  lines: L[],
): Promise<(L & { tierLabel: string })[]> {
  if (lines.every(l => l.tierLabel)) return lines.map(l => ({ ...l, tierLabel: l.tierLabel! }))
  const ids = [...new Set(lines.map(l => l.productId))]
  const rows = ids.length
    ? await db.select().from(priceTiers).where(inArray(priceTiers.productId, ids))
    : []
  return lines.map((l) => {
    const tiers = rows.filter(t => t.productId === l.productId)
    const tier = tiers.find(t => t.minQuantity === l.tierMinQuantity)
    return {
      ...l,
      tierLabel: l.tierLabel || (tier ? tierRangeLabel(tiers, tier) : `${l.tierMinQuantity}+`),
    }
  })
}
