import { readFileSync } from 'node:fs';
import { canPublish, canSubscribe, renderMosquittoAcl } from '@thermargin/broker/acl';
import { describe, expect, it } from 'vitest';
import { DOCUMENTED_TEST_USERS } from './test-users.ts';

const vehicle = { username: 'bus-01', role: 'vehicle' as const };
const ingester = { username: 'ingester', role: 'ingester' as const };

describe('broker ACL rules', () => {
  it('a vehicle publishes only to its own sample and frames topics, and subscribes to nothing', () => {
    expect(canPublish(vehicle, 'thermargin/v1/vehicles/bus-01/samples')).toBe(true);
    expect(canPublish(vehicle, 'thermargin/v1/vehicles/bus-01/frames')).toBe(true);
    expect(canPublish(vehicle, 'thermargin/v1/vehicles/bus-02/samples')).toBe(false);
    expect(canPublish(vehicle, 'thermargin/v1/vehicles/bus-02/frames')).toBe(false);
    expect(canPublish(vehicle, 'thermargin/v1/vehicles/bus-01/other')).toBe(false);
    expect(canPublish(vehicle, 'thermargin/v1/vehicles/+/samples')).toBe(false);
    expect(canSubscribe(vehicle, 'thermargin/v1/vehicles/bus-01/samples')).toBe(false);
  });
  it('the ingester subscribes (plainly or shared) and publishes nothing', () => {
    expect(canSubscribe(ingester, 'thermargin/v1/vehicles/+/samples')).toBe(true);
    expect(canSubscribe(ingester, '$share/ingesters/thermargin/v1/vehicles/+/samples')).toBe(true);
    expect(canSubscribe(ingester, '$share/ingesters/thermargin/v1/vehicles/+/frames')).toBe(true);
    expect(canSubscribe(ingester, 'thermargin/v1/vehicles/+/+')).toBe(false);
    expect(canSubscribe(ingester, '#')).toBe(false);
    expect(canSubscribe(ingester, '$share/g/#')).toBe(false);
    expect(canPublish(ingester, 'thermargin/v1/vehicles/ingester/samples')).toBe(false);
  });
  it('the shipped config/mosquitto/acl is the one rendered from these rules for the documented test users', () => {
    expect(readFileSync('config/mosquitto/acl', 'utf8')).toBe(renderMosquittoAcl(DOCUMENTED_TEST_USERS));
  });
  it('refuses to render an id that is not topic-safe', () => {
    expect(() => renderMosquittoAcl([{ username: 'a/b', role: 'vehicle' }])).toThrow(/not a valid id/);
  });
});
