import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { COMPRESS_FROM_BYTES } from '../../api/app';
import { testApp } from '../support/app';
import { closeTestKnex } from '../support/db';

afterAll(closeTestKnex);

const C = (value: number) => ({ value, unit: 'C' });
const forecast = (count: number) => ({
  basis: { kind: 'observed', selectivity: { measure: 'ee', value: 90 }, temperature: C(25) },
  temperatures: { from: C(-60), to: C(40), count },
});

describe('compressed answers', () => {
  it('when a large answer goes to a client that accepts brotli or gzip, then it travels compressed and reads the same', async () => {
    const { app } = testApp();
    const plain = await request(app).post('/api/v1/forecast').set('accept-encoding', 'identity').send(forecast(200)).expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(Number(plain.headers['content-length'])).toBeGreaterThan(COMPRESS_FROM_BYTES);

    const br = await request(app).post('/api/v1/forecast').set('accept-encoding', 'gzip, deflate, br').send(forecast(200)).expect(200);
    expect(br.headers['content-encoding']).toBe('br');
    expect(br.headers.vary).toMatch(/accept-encoding/i);
    expect(br.body).toEqual(plain.body);

    const gzip = await request(app).post('/api/v1/forecast').set('accept-encoding', 'gzip').send(forecast(200)).expect(200);
    expect(gzip.headers['content-encoding']).toBe('gzip');
    expect(gzip.body).toEqual(plain.body);
  });

  it('when an answer is below the threshold, then it goes uncompressed whatever the client accepts', async () => {
    const { app } = testApp();
    const small = await request(app).post('/api/v1/forecast').set('accept-encoding', 'gzip, deflate, br').send(forecast(2)).expect(200);
    expect(small.headers['content-encoding']).toBeUndefined();
    expect(Number(small.headers['content-length'])).toBeLessThan(COMPRESS_FROM_BYTES);
  });
});
