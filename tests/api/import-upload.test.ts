import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import express from 'express';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import pino from 'pino';
import { problemHandler } from '../../api/lib/problem';
import { importUpload, jsonField, uploadedFile } from '../../api/features/imports/upload';
import { previewImport } from '../../api/features/imports/service';
import { importPreviewRequestSchema } from '../../api/features/campaigns/schemas';
import { sample } from '../unit/imports/helpers';

// A route shaped like the import preview will be: upload → parse options → preview → respond.
const app = express();
app.post('/preview', importUpload(), async (req, res) => {
  const body = jsonField(req, 'request', importPreviewRequestSchema);
  res.json(await previewImport(uploadedFile(req), body));
});
app.use(problemHandler(pino({ level: 'silent' })));

let server: http.Server;
let port: number;
beforeAll(async () => {
  server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  port = (server.address() as AddressInfo).port;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

describe('import upload', () => {
  it('when a sample file is uploaded with parse options, then the preview comes back', async () => {
    const file = sample('kestrelmoor-merlin-screen-de.csv');
    const res = await request(server)
      .post('/preview')
      .attach('file', file.buffer, file.name)
      .field('request', JSON.stringify({ parse: { headerRow: 3 } }));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      rowCount: 9,
      validRowCount: 9,
      errorCount: 0,
      file: { delimiter: ';', decimalSeparator: ',', headerRow: 3 },
    });
  });

  it('when no file is sent, then 400 names the form field', async () => {
    const res = await request(server).post('/preview').field('request', '{}');
    expect(res.status).toBe(400);
    expect(res.body.errors).toEqual([{ path: 'file', message: 'a file is required' }]);
  });

  it('when the options are not JSON or break the schema, then 400 names the field', async () => {
    const file = sample('kestrelmoor-skylark-screen.csv');
    const bad = await request(server).post('/preview').attach('file', file.buffer, file.name).field('request', '{parse:');
    expect(bad.status).toBe(400);
    expect(bad.body.detail).toBe('The form field "request" is not valid JSON.');
    const wrong = await request(server)
      .post('/preview')
      .attach('file', file.buffer, file.name)
      .field('request', JSON.stringify({ parse: { delimiter: '|' } }));
    expect(wrong.status).toBe(400);
    expect(wrong.body.errors[0].path).toBe('request.parse.delimiter');
  });

  it('when two files are sent, then 400 says to send exactly one', async () => {
    const file = sample('kestrelmoor-skylark-screen.csv');
    const res = await request(server).post('/preview').attach('file', file.buffer, file.name).attach('other', file.buffer, file.name);
    expect(res.status).toBe(400);
    expect(res.body.detail).toBe('Send exactly one file, in the form field "file".');
  });

  /** Stream a 200 MB multipart upload; returns the answer and how many MB had gone out when it came. */
  function send200Mb(declareLength: boolean): Promise<{ status: number; detail: string; sentWhenAnswered: number }> {
    const boundary = '----eyrie-test-boundary';
    const head = Buffer.from(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="plant-log.csv"\r\nContent-Type: text/csv\r\n\r\n`,
    );
    const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
    const mb = Buffer.alloc(1024 * 1024, 0x31);
    const total = 200;
    const headers: Record<string, string | number> = { 'content-type': `multipart/form-data; boundary=${boundary}` };
    if (declareLength) headers['content-length'] = head.length + total * mb.length + tail.length;
    let sent = 0;
    let sentWhenAnswered = -1;
    return new Promise((resolve, reject) => {
      const req = http.request({ host: '127.0.0.1', port, method: 'POST', path: '/preview', headers }, (res) => {
        let body = '';
        res.on('data', (c) => (body += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, detail: JSON.parse(body).detail, sentWhenAnswered }));
      });
      // The server may close the connection while we are still writing; the answer is what counts.
      req.on('error', (err) => (sentWhenAnswered >= 0 ? undefined : reject(err)));
      req.once('response', () => {
        sentWhenAnswered = sent;
        sent = total;
      });
      req.write(head);
      const pump = () => {
        while (sent < total) {
          sent += 1;
          if (!req.write(mb)) return void req.once('drain', pump);
        }
        if (sentWhenAnswered < 0) req.end(tail);
      };
      pump();
    });
  }

  it('when a 200 MB upload declares its size, then 413 comes back before most of it is sent', async () => {
    const r = await send200Mb(true);
    expect(r.status).toBe(413);
    expect(r.detail).toBe('The file is larger than 10 MB, the largest accepted. Split it, or remove columns you do not need.');
    expect(r.sentWhenAnswered).toBeGreaterThanOrEqual(0);
    expect(r.sentWhenAnswered).toBeLessThan(100);
  });

  it('when a 200 MB upload streams without a declared size, then it is cut off at the limit and answered 413', async () => {
    const before = process.memoryUsage().rss;
    const r = await send200Mb(false);
    expect(r.status).toBe(413);
    expect(r.detail).toContain('larger than 10 MB');
    // Counted while streaming, never held: far less than 200 MB more memory in this process.
    expect(process.memoryUsage().rss - before).toBeLessThan(120 * 1024 * 1024);
  });
});
