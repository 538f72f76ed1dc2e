import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { brotliOnce, COMPRESS_FROM_BYTES } from '../../api/lib/compress';
import { testApp } from '../support/app';
import { signIn, startAuthApp } from '../support/auth';
import { closeTestKnex, testKnex } from '../support/db';
import { insertSyntheticScreen } from '../../scripts/bench/synthetic-screen';

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

  it('when a large campaign analysis goes to a browser, then it is the brotli copy kept with the cached answer, the same JSON, and a 304 still answers its tag', async () => {
    const auth = await startAuthApp();
    try {
      const { agent, user } = await signIn(auth.app, { login: 'squeeze-1', name: 'Squeeze', email: 'squeeze-1@example.test' });
      const screen = await insertSyntheticScreen(testKnex(), user.id, { project: 'Compression check', campaign: 'Synthetic screen' }, 300);
      const url = `/api/v1/campaigns/${screen.campaignId}/analysis?weighting=none&confidence=0.95`;
      const plain = await agent.get(url).set('accept-encoding', 'identity').expect(200);
      expect(plain.headers['content-encoding']).toBeUndefined();
      expect(Number(plain.headers['content-length'])).toBeGreaterThan(COMPRESS_FROM_BYTES);
      for (const accept of ['gzip, deflate, br, zstd', 'br']) {
        const packed = await agent.get(url).set('accept-encoding', accept).expect(200);
        expect(packed.headers['content-encoding']).toBe('br');
        expect(packed.headers.vary).toMatch(/accept-encoding/i);
        // The copy compressed once at the higher quality, not the middleware's on-the-fly one.
        expect(Number(packed.headers['content-length'])).toBe((await brotliOnce(plain.text)).length);
        expect(Number(packed.headers['content-length'])).toBeLessThan(Number(plain.headers['content-length']) / 3);
        expect(packed.body).toEqual(plain.body);
        expect(packed.headers.etag).toBe(plain.headers.etag);
      }
      // A client without brotli gets the middleware's gzip of the same body.
      const gzip = await agent.get(url).set('accept-encoding', 'gzip').expect(200);
      expect(gzip.headers['content-encoding']).toBe('gzip');
      expect(gzip.body).toEqual(plain.body);
      await agent.get(url).set('accept-encoding', 'br').set('if-none-match', plain.headers.etag).expect(304);
      await testKnex()('projects').where({ id: screen.projectId }).delete();
    } finally {
      await auth.close();
    }
  });
});
