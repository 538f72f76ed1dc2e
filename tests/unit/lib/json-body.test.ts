import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { jsonPieces, sendComputed } from '../../../api/lib/json-body';

const same = (body: unknown) => expect(jsonPieces(body).join('')).toBe(JSON.stringify(body) ?? 'null');

const answer = {
  caution: 'Verify experimentally — ΔΔG‡ ≥ 0; T − 20 °C',
  predictions: Array.from({ length: 50 }, (_, i) => ({
    kelvin: 200 + i / 3,
    ratio: i === 3 ? null : Math.exp(i / 7),
    flags: ['outlier'],
  })),
  skipped: undefined,
  note: 'χ²/dof = 1.2 ± 0.1',
};

describe('jsonPieces', () => {
  it('when an answer mixes numbers and text outside Latin-1, then its pieces join to JSON.stringify, the long member apart', () => {
    same(answer);
    // The number-heavy member is a piece of its own, JSON.stringify's own string (one byte per
    // character), never joined to the text around it; the short members and the keys share the rest.
    const pieces = jsonPieces(answer);
    expect(pieces).toEqual([
      '{"caution":"Verify experimentally — ΔΔG‡ ≥ 0; T − 20 °C","predictions":',
      JSON.stringify(answer.predictions),
      ',"note":"χ²/dof = 1.2 ± 0.1"}',
    ]);
  });

  it('when every member is short, then the answer is one piece', () => {
    same({ a: 1, b: 'two', c: [3] });
    expect(jsonPieces({ a: 1, b: 'two', c: [3] })).toHaveLength(1);
  });

  it('when members are undefined, functions or nested toJSON, then they are left out or converted as JSON does', () => {
    same({ a: undefined, b: () => 1, c: new Date(0), d: { toJSON: () => 'x' }, e: [undefined, 1], 'quote"key': 'π' });
    same({ only: undefined });
    same({});
  });

  it('when the body is not a plain object, then it is serialised whole', () => {
    same([1, 'Δ', null]);
    same(null);
    same('text −');
    same(3.5);
    same(new Date(0));
  });
});

describe('sendComputed', () => {
  const app = express();
  app.post('/answer', (_req, res) => sendComputed(res, answer));
  app.post('/empty', (_req, res) => sendComputed(res, {}));

  it("when an answer is sent over HTTP, then the bytes are JSON.stringify's, with their type and exact length, and no ETag", async () => {
    const res = await request(app)
      .post('/answer')
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      });
    const expected = Buffer.from(JSON.stringify(answer), 'utf8');
    expect((res.body as Buffer).equals(expected)).toBe(true);
    expect(res.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(Number(res.headers['content-length'])).toBe(expected.length);
    expect(res.headers.etag).toBeUndefined();
  });

  it('when the answer is an empty object, then "{}" is sent', async () => {
    const res = await request(app).post('/empty');
    expect(res.text).toBe('{}');
    expect(res.headers['content-length']).toBe('2');
  });
});
