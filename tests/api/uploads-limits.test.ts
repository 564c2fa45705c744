import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, demoEmail, startTestServer, type TestServer } from '../support/test-server';

let ts: TestServer;
let small: TestServer;
beforeAll(async () => {
  [ts, small] = await Promise.all([startTestServer(), startTestServer({ RECORD_MAX_UPLOAD_MB: '1' })]);
});
afterAll(async () => {
  await Promise.all([ts?.close(), small?.close()]);
});

const CSV = 'Elapsed (s),Level (m)\n0,3.0\n1,2.5\n2,2.2\n3,2.1\n';

/** A signed-in session's cookie and CSRF token, for requests written by hand. */
async function signedIn(server: TestServer, email: string): Promise<{ cookie: string; csrf: string }> {
  const first = await fetch(`${server.baseUrl}/api/auth/csrf`);
  let cookie = first.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const login = await fetch(`${server.baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': (await first.json()).csrfToken, cookie },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  expect(login.status).toBe(200);
  cookie = login.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ') || cookie;
  return { cookie, csrf: (await login.json()).csrfToken };
}

function multipart(parts: { name: string; value: string; filename?: string }[], boundary = 'kfield-test-boundary'): Buffer {
  const body = parts
    .map((p) =>
      `--${boundary}\r\nContent-Disposition: form-data; name="${p.name}"${p.filename ? `; filename="${p.filename}"\r\nContent-Type: text/csv` : ''}\r\n\r\n${p.value}\r\n`,
    )
    .join('');
  return Buffer.from(`${body}--${boundary}--\r\n`);
}

/** Writes the head with the given Content-Length and then only `body`; resolves with the status line's code. */
function rawPost(server: TestServer, path: string, head: Record<string, string>, body: Buffer): Promise<number> {
  const { port } = new URL(server.baseUrl);
  return new Promise((resolve, reject) => {
    const socket = net.connect(Number(port), '127.0.0.1');
    let got = '';
    const timer = setTimeout(() => {
      socket.destroy();
      reject(new Error(`no answer within 10 s; received: ${JSON.stringify(got.slice(0, 200))}`));
    }, 10_000);
    socket.on('data', (d) => {
      got += d.toString('latin1');
      const m = /^HTTP\/1\.1 (\d{3})/.exec(got);
      if (m) {
        clearTimeout(timer);
        socket.destroy();
        resolve(Number(m[1]));
      }
    });
    socket.on('error', (e) => {
      clearTimeout(timer);
      reject(e);
    });
    socket.on('close', () => {
      clearTimeout(timer);
      reject(new Error(`connection closed without an answer; received: ${JSON.stringify(got.slice(0, 200))}`));
    });
    const lines = [`POST ${path} HTTP/1.1`, `Host: 127.0.0.1:${port}`, ...Object.entries(head).map(([k, v]) => `${k}: ${v}`)];
    socket.write(`${lines.join('\r\n')}\r\n\r\n`);
    socket.write(body);
  });
}

describe('an upload whose Content-Length is far beyond any limit', () => {
  it('is refused with 413 and the server keeps serving', async () => {
    const { cookie, csrf } = await signedIn(ts, demoEmail('Viewer'));
    const body = multipart([{ name: 'file', value: CSV, filename: 'x.csv' }]);
    const status = await rawPost(
      ts,
      '/api/records/preview',
      { cookie, 'x-csrf-token': csrf, 'content-type': 'multipart/form-data; boundary=kfield-test-boundary', 'content-length': '1000000000000' },
      body,
    );
    expect(status).toBe(413);
    expect((await fetch(`${ts.baseUrl}/api/health`)).status).toBe(200);
  });

  it('is refused before its body is read when the declared length is over the limit', async () => {
    const { cookie, csrf } = await signedIn(small, demoEmail('Analyst'));
    // Only the head is sent: an answer can come only from the declared length.
    const status = await rawPost(
      small,
      '/api/records/preview',
      { cookie, 'x-csrf-token': csrf, 'content-type': 'multipart/form-data; boundary=kfield-test-boundary', 'content-length': String(5 * 1024 * 1024) },
      Buffer.alloc(0),
    );
    expect(status).toBe(413);
  });
});

describe('a chunked upload with no Content-Length that goes on and on', () => {
  it('is cut off with 413 once past the limit, without waiting for its end', async () => {
    const { cookie, csrf } = await signedIn(small, demoEmail('Analyst'));
    const { port } = new URL(small.baseUrl);
    const answer = await new Promise<{ head: string; closedAfterMs: number }>((resolve, reject) => {
      const socket = net.connect(Number(port), '127.0.0.1');
      let got = '';
      let sent = 0;
      let answeredAt = 0;
      const timer = setTimeout(() => {
        clearInterval(pump);
        socket.destroy();
        reject(new Error(`no answer, or no close, after ${sent} bytes; received: ${JSON.stringify(got.slice(0, 200))}`));
      }, 20_000);
      socket.on('data', (d) => {
        got += d.toString('latin1');
        if (!answeredAt && /^HTTP\/1\.1 \d{3}[\s\S]*\r\n\r\n/.test(got)) answeredAt = Date.now();
      });
      socket.on('error', () => undefined);
      // The client goes on sending after the answer: the server is the one to close.
      socket.on('close', () => {
        clearTimeout(timer);
        clearInterval(pump);
        if (!answeredAt) reject(new Error(`closed without an answer after ${sent} bytes`));
        else resolve({ head: got, closedAfterMs: Date.now() - answeredAt });
      });
      socket.write(
        [
          'POST /api/records/preview HTTP/1.1', `Host: 127.0.0.1:${port}`, `cookie: ${cookie}`, `x-csrf-token: ${csrf}`,
          'content-type: multipart/form-data; boundary=kfield-test-boundary', 'transfer-encoding: chunked', '', '',
        ].join('\r\n'),
      );
      // A preamble before the first boundary, which a multipart parser skips: it only costs bytes.
      const chunk = Buffer.alloc(256 * 1024, 'x');
      const pump = setInterval(() => {
        if (socket.destroyed || socket.writableLength > 8 * 1024 * 1024) return;
        socket.write(`${chunk.length.toString(16)}\r\n`);
        socket.write(chunk);
        socket.write('\r\n');
        sent += chunk.length;
      }, 5);
    });
    expect(answer.head).toMatch(/^HTTP\/1\.1 413/);
    expect(answer.head).toMatch(/TOO_LARGE/);
    expect(answer.closedAfterMs).toBeLessThan(10_000);
    expect((await fetch(`${small.baseUrl}/api/health`)).status).toBe(200);
  });
});

describe('a real upload over RECORD_MAX_UPLOAD_MB', () => {
  it('gets 413 TOO_LARGE naming the limit in MB', async () => {
    const c = await small.as(demoEmail('Analyst'));
    const big = Buffer.from(`Elapsed (s),Level (m)\n${Array.from({ length: 120_000 }, (_, i) => `${i},3.000000`).join('\n')}\n`);
    expect(big.length).toBeGreaterThan(1024 * 1024);
    const r = await c.agent.post('/api/records/preview').set('x-csrf-token', c.csrf).attach('file', big, 'big.csv');
    expect(r.status).toBe(413);
    expect(r.body.error.code).toBe('TOO_LARGE');
    expect(r.body.error.message).toMatch(/\b1 MB\b/);
    expect((await fetch(`${small.baseUrl}/api/health`)).status).toBe(200);
  });
});

describe('multipart fields', () => {
  const post = async (parts: { name: string; value: string; filename?: string }[]) => {
    const c = await ts.as(demoEmail('Analyst'));
    return c.agent
      .post('/api/records/preview')
      .set('x-csrf-token', c.csrf)
      .set('content-type', 'multipart/form-data; boundary=kfield-test-boundary')
      .send(multipart(parts));
  };
  const file = { name: 'file', value: CSV, filename: 'x.csv' };

  it.each(['settings', 'sampled'])('refuses "%s" sent twice with a 400 naming it', async (name) => {
    const r = await post([file, { name, value: name === 'settings' ? '{}' : 'file' }, { name, value: name === 'settings' ? '{}' : 'file' }]);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.message).toBe(`The multipart field "${name}" was sent twice; send it once`);
    expect(r.body.error.fields).toHaveProperty(name);
  });

  it('refuses the file sent twice with a 400 naming it', async () => {
    const r = await post([file, file]);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.message).toBe('The multipart field "file" was sent twice; send it once');
  });

  it('refuses a field it does not know with a 400 naming it', async () => {
    const r = await post([file, { name: 'settings[layout]', value: '{}' }]);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.message).toMatch(/"settings\[layout\]"/);
  });

  it('still reads a well-formed upload', async () => {
    const r = await post([file, { name: 'settings', value: '{}' }]);
    expect(r.status, JSON.stringify(r.body)).toBe(200);
  });
});
