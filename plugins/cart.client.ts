// The cart lives in the browser: restore it once the app starts on the client.
export default defineNuxtPlugin(() => {
  useCartStore().restore()
})
