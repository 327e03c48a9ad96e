/** The benchmark's HTTP client (tests/bench/harness.ts and the platform probe of analysis.bench.ts). */
import http from 'node:http';

export interface HttpClient {
  get(pathAndQuery: string): Promise<{ status: number; body: unknown; bytes: number }>;
}

/**
 * A GET client on one kept-alive node:http socket: the thinnest client, as the bare SQL goes
 * through pg (fetch ran in this same event loop and added about 1 ms a request).
 */
export function keptAliveClient(baseUrl: string, headers: Record<string, string> = {}): HttpClient {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  const { hostname, port } = new URL(baseUrl);
  return {
    get(p) {
      return new Promise((resolve, reject) => {
        const req = http.request({ host: hostname, port, path: p, agent, headers }, (res) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('error', reject);
          res.on('end', () => {
            const buf = Buffer.concat(chunks);
            const type = String(res.headers['content-type'] ?? '');
            try {
              resolve({ status: res.statusCode ?? 0, body: type.includes('json') ? JSON.parse(buf.toString('utf8')) : buf, bytes: buf.length });
            } catch (e) { reject(e); }
          });
        });
        req.on('error', reject);
        req.end();
      });
    },
  };
}
