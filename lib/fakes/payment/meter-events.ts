import { activeMeterForEvent, requireMeter } from './catalogue';
import { PAGE_PARAMS, listBody, type ApiContext } from './common';
import { requireCustomer } from './customers';
import { invalidRequest } from './errors';
import type { Params } from './form';
import { newId } from './ids';
import { aggregate } from './store';
import type { FakeMeterEvent, FakeMeterEventSummary } from './types';

/** How far back and forward a meter event's `timestamp` may lie, as the API documents. */
export const MAX_PAST_SECONDS = 35 * 86_400;
export const MAX_FUTURE_SECONDS = 5 * 60;

/**
 * `POST /v1/billing/meter_events`. The API checks some of this later and reports it asynchronously;
 * the fake refuses at once (unknown meter or customer, a bad value) so a mistake shows in the test.
 */
export function createMeterEvent(ctx: ApiContext, params: Params): FakeMeterEvent {
  params.allowOnly(['event_name', 'payload', 'identifier', 'timestamp', 'expand']);
  const eventName = params.requireStr('event_name');
  const meter = activeMeterForEvent(ctx.store, eventName);
  if (!meter) {
    throw invalidRequest(`No active meter exists with event_name \`${eventName}\`.`, 'event_name', 'resource_missing');
  }
  const payloadParams = params.obj('payload');
  if (!payloadParams) throw invalidRequest('Missing required param: payload.', 'payload', 'parameter_missing');
  const payload: Record<string, string> = {};
  for (const key of payloadParams.keys()) {
    const value = payloadParams.str(key);
    if (value !== undefined) payload[key] = value;
  }
  const customerKey = meter.customer_mapping.event_payload_key;
  const valueKey = meter.value_settings.event_payload_key;
  const customerId = payload[customerKey];
  if (!customerId) {
    throw invalidRequest(
      `Missing required param: payload[${customerKey}].`,
      `payload[${customerKey}]`,
      'parameter_missing',
    );
  }
  requireCustomer(ctx, customerId, `payload[${customerKey}]`);
  let value = 1;
  if (meter.default_aggregation.formula !== 'count') {
    const raw = payload[valueKey];
    if (raw === undefined) {
      throw invalidRequest(
        `Missing required param: payload[${valueKey}].`,
        `payload[${valueKey}]`,
        'parameter_missing',
      );
    }
    if (!/^\d+$/.test(raw)) {
      throw invalidRequest(
        `payload[${valueKey}] must be a whole number of units, 0 or more; got '${raw}'.`,
        `payload[${valueKey}]`,
        'meter_event_invalid_value',
      );
    }
    value = Number(raw);
  }

  const identifier = params.str('identifier') || newId('mev');
  if (identifier.length > 100) {
    throw invalidRequest(
      'identifier can have up to 100 characters.',
      'identifier',
      'parameter_invalid_string_too_long',
    );
  }
  if (ctx.store.hasMeterEvent(identifier)) {
    throw invalidRequest(
      `An event already exists with identifier ${identifier}.`,
      'identifier',
      'resource_already_exists',
    );
  }

  const timestamp = params.int('timestamp') ?? ctx.now;
  if (timestamp < ctx.now - MAX_PAST_SECONDS) {
    throw invalidRequest(
      'Timestamp must be within the past 35 calendar days.',
      'timestamp',
      'timestamp_too_far_in_past',
    );
  }
  if (timestamp > ctx.now + MAX_FUTURE_SECONDS) {
    throw invalidRequest(
      'Timestamp must not be more than 5 minutes in the future.',
      'timestamp',
      'timestamp_in_future',
    );
  }

  const event: FakeMeterEvent = {
    object: 'billing.meter_event',
    created: ctx.now,
    event_name: eventName,
    identifier,
    livemode: false,
    payload,
    timestamp,
  };
  ctx.store.insertMeterEvent({ event, meter: meter.id, customer: customerId, value });
  return event;
}

const WINDOWS = { hour: 3_600, day: 86_400 } as const;

/** `GET /v1/billing/meters/{id}/event_summaries`: aggregated values over `[start_time, end_time)`. */
export function listEventSummaries(ctx: ApiContext, params: Params, meterId: string) {
  params.allowOnly([...PAGE_PARAMS, 'customer', 'start_time', 'end_time', 'value_grouping_window']);
  const meter = requireMeter(ctx, meterId);
  const customer = params.requireStr('customer');
  requireCustomer(ctx, customer, 'customer');
  const start = params.requireInt('start_time', { min: 0 });
  const end = params.requireInt('end_time', { min: 0 });
  const grouping = params.oneOf('value_grouping_window', ['hour', 'day'] as const);
  const step = grouping ? WINDOWS[grouping] : 60;
  for (const [name, value] of [
    ['start_time', start],
    ['end_time', end],
  ] as const) {
    if (value % step !== 0) {
      const boundary = grouping ?? 'minute';
      throw invalidRequest(`${name} must be aligned with ${boundary} boundaries.`, name);
    }
  }
  if (end <= start) throw invalidRequest('end_time must be after start_time.', 'end_time');

  const windows: [number, number][] = grouping ? [] : [[start, end]];
  if (grouping) for (let t = start; t < end; t += step) windows.push([t, Math.min(t + step, end)]);
  const summaries: FakeMeterEventSummary[] = windows.map(([from, to]) => ({
    id: `mtrusg_${meter.id.slice(4, 14)}${from.toString(36)}`,
    object: 'billing.meter_event_summary',
    aggregated_value: aggregate(
      meter.default_aggregation.formula,
      ctx.store.meterEventsInWindow(meter.id, customer, from, to),
    ),
    end_time: to,
    livemode: false,
    meter: meter.id,
    start_time: from,
  }));

  const limit = params.int('limit', { min: 1, max: 100 }) ?? 10;
  const after = params.str('starting_after');
  let from = 0;
  if (after) {
    const i = summaries.findIndex((s) => s.id === after);
    from = i < 0 ? summaries.length : i + 1;
  }
  const page = summaries.slice(from, from + limit);
  return listBody(`/v1/billing/meters/${meter.id}/event_summaries`, page, from + limit < summaries.length);
}
