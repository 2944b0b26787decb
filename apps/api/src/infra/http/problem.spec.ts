/**
 * Which failures answer 503 (the database is gone for now) rather than 500. The fault runs (npm run faults)
 * prove the same through the built service on a real PostgreSQL that is terminated and restarted.
 */
import { databaseUnavailable, toProblem } from './problem';

describe('database unavailable -> 503 problem', () => {
  const pgError = (code: string, message = 'x') => Object.assign(new Error(message), { code });

  it.each([
    ['admin shutdown (pg_terminate_backend), SQLSTATE 57P01', pgError('57P01', 'terminating connection due to administrator command')],
    ['cannot connect now (starting up), SQLSTATE 57P03', pgError('57P03', 'the database system is starting up')],
    ['connection failure, SQLSTATE 08006, wrapped by TypeORM', Object.assign(new Error('query failed'), { driverError: pgError('08006') })],
    ['server gone: ECONNREFUSED', pgError('ECONNREFUSED', 'connect ECONNREFUSED 127.0.0.1:5432')],
    ['socket closed mid-query', new Error('Connection terminated unexpectedly')],
    ['every address refused', Object.assign(new AggregateError([pgError('ECONNREFUSED')], 'connect failed'))],
  ])('%s', (_name, err) => {
    expect(databaseUnavailable(err)).toBe(true);
    expect(toProblem(err)).toMatchObject({ status: 503, title: 'Database unavailable' });
  });

  it.each([
    ['a unique violation (23505)', pgError('23505', 'duplicate key value')],
    ['a programming error', new TypeError('cannot read properties of undefined')],
    ['a non-error', 'boom'],
  ])('%s stays 500', (_name, err) => {
    expect(databaseUnavailable(err)).toBe(false);
    expect(toProblem(err).status).toBe(500);
  });
});
