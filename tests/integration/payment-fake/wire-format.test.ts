import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { METER_EVENT_NAME } from '../../../lib/billing/plans';
import { Params, parseForm, type ParamObject } from '../../../lib/fakes/payment/form';
import { API_KEY, startHarness, type Harness } from './harness';

describe('test tool (local payment fake): form bodies with bracketed keys', () => {
  it.each<{ body: string; expected: ParamObject }>([
    { body: 'email=a%40b.test&name=A+B', expected: { email: 'a@b.test', name: 'A B' } },
    { body: 'metadata[k]=v&metadata[7]=x', expected: { metadata: { k: 'v', 7: 'x' } } },
    {
      body: 'items[0][price]=p1&items[1][price]=p2&items[1][quantity]=3',
      expected: { items: { 0: { price: 'p1' }, 1: { price: 'p2', quantity: '3' } } },
    },
    { body: 'expand[]=a&expand[]=b.c', expected: { expand: ['a', 'b.c'] } },
    {
      body: 'payload%5Bstripe_customer_id%5D=cus_1&payload%5Bvalue%5D=3',
      expected: { payload: { stripe_customer_id: 'cus_1', value: '3' } },
    },
    {
      body: 'invoice_settings[default_payment_method]=',
      expected: { invoice_settings: { default_payment_method: '' } },
    },
    { body: 'odd]key=1&a[b=2', expected: { 'odd]key': '1', 'a[b': '2' } },
  ])('$body', ({ body, expected }) => {
    expect(parseForm(body)).toEqual(expected);
  });

  it('lists read the same from [n] and [] forms, in index order', () => {
    expect(new Params(parseForm('expand[1]=b&expand[0]=a')).strList('expand')).toEqual(['a', 'b']);
    expect(new Params(parseForm('expand[]=a&expand[]=b')).strList('expand')).toEqual(['a', 'b']);
    const items = new Params(parseForm('items[0][price]=p1&items[1][price]=p2')).objList('items')!;
    expect(items.map((i) => i.str('price'))).toEqual(['p1', 'p2']);
    expect(items[1].name('price')).toBe('items[1][price]');
  });
});

describe('test tool (local payment fake): raw HTTP against the fake', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h.close();
  });

  async function post(path: string, body: string, headers: Record<string, string> = {}) {
    const res = await fetch(`${h.fake.url}${path}`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${API_KEY}`, 'Content-Type': 'application/x-www-form-urlencoded', ...headers },
      body,
    });
    return { status: res.status, headers: res.headers, body: (await res.json()) as Record<string, unknown> };
  }

  it('accepts literal and percent-encoded brackets alike, and echoes Stripe-Version', async () => {
    const created = await post('/v1/customers', 'email=raw%40example.test&metadata[workspace]=ws_1', {
      'Stripe-Version': '2025-11-17.clover',
    });
    expect(created.status).toBe(200);
    expect(created.headers.get('stripe-version')).toBe('2025-11-17.clover');
    expect(created.headers.get('request-id')).toMatch(/^req_/);
    expect(created.body).toMatchObject({
      object: 'customer',
      email: 'raw@example.test',
      metadata: { workspace: 'ws_1' },
    });
    const event = await post(
      '/v1/billing/meter_events',
      `event_name=${METER_EVENT_NAME}&payload%5Bstripe_customer_id%5D=${String(created.body.id)}&payload%5Bvalue%5D=2`,
    );
    expect(event.status).toBe(200);
    expect(event.body).toMatchObject({ payload: { value: '2' } });
  });

  it('errors come back as { error: { type, code, message, param } }', async () => {
    const res = await post('/v1/customers', 'nonsense=1');
    expect(res.status).toBe(400);
    expect(res.body).toEqual({
      error: {
        type: 'invalid_request_error',
        code: 'parameter_unknown',
        message: 'Received unknown parameter: nonsense',
        param: 'nonsense',
      },
    });
  });

  it('an oversized body is refused', async () => {
    const res = await post('/v1/customers', `description=${'x'.repeat(1_100_000)}`);
    expect(res.status).toBe(413);
  });
});
