import { describe, expect, it } from 'vitest'
import { parseBracketForm } from '../../server/fake-payments/form'

describe('the fake provider\'s form decoding', () => {
  it('rebuilds nested objects and arrays from bracket keys the SDK sends', () => {
    const body
      = 'mode=payment&line_items[0][quantity]=12&line_items[0][price_data][unit_amount]=11900'
        + '&line_items[1][quantity]=1&metadata[orderId]=7&expand[0]=customer'
    expect(parseBracketForm(body)).toEqual({
      mode: 'payment',
      line_items: [{ quantity: '12', price_data: { unit_amount: '11900' } }, { quantity: '1' }],
      metadata: { orderId: '7' },
      expand: ['customer'],
    })
  })

  it('decodes percent-encoded brackets and values', () => {
    expect(parseBracketForm('metadata%5BpoNumber%5D=PO%2F2026%2017')).toEqual({
      metadata: { poNumber: 'PO/2026 17' },
    })
  })

  it('orders array items by index, not by arrival', () => {
    expect(parseBracketForm('l[1]=b&l[0]=a&l[10]=c')).toEqual({ l: ['a', 'b', 'c'] })
  })
})
