import type { BrokerUser } from '@thermargin/broker/acl';

/** The documented test credentials of config/mosquitto/README.md (demo and tests only). */
export const DOCUMENTED_TEST_USERS: BrokerUser[] = [
  { username: 'ingester', password: 'test-ingester-pw', role: 'ingester' },
  { username: 'bus-01', password: 'test-bus-01-pw', role: 'vehicle' },
  { username: 'bus-02', password: 'test-bus-02-pw', role: 'vehicle' },
  { username: 'van-03', password: 'test-van-03-pw', role: 'vehicle' },
  { username: 'truck-04', password: 'test-truck-04-pw', role: 'vehicle' },
];
