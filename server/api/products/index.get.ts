// The public catalog: every product on sale with its classroom tiers and what is left.
// A builder (a student) gets the kits without prices.
export default defineEventHandler(async (event) => {
  const catalog = await loadCatalog(useDb(), { activeOnly: true })
  const hide = await hidePricesFor(event)
  return { data: catalog.map(e => withoutPricesIf(hide, productView(e))) }
})
