import fs from 'node:fs';
import https from 'node:https';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { X509Certificate } from 'node:crypto';
import { generate } from 'selfsigned';
import { ConfigError, loadConfig } from '../../server/config';
import { listen } from '../../server/listen';
import { makeEnv, type TestEnv } from './helpers';

// A service worker registers only in a secure context (W3C Service Workers, "secure context"
// requirement), so the server can speak HTTPS itself from a certificate and key in its configuration.

let env: TestEnv;
let dir: string;
let certFile: string;
let keyFile: string;
let certPem: string;

beforeAll(async () => {
  env = await makeEnv({ seed: false });
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'warmfold-tls-'));
  // A test certificate for localhost, made here by a registry library (selfsigned), not by the product.
  const pems = await generate([{ name: 'commonName', value: 'localhost' }], {
    keySize: 2048,
    extensions: [
      {
        name: 'subjectAltName',
        altNames: [
          { type: 2, value: 'localhost' },
          { type: 7, ip: '127.0.0.1' },
        ],
      },
    ],
  });
  certPem = pems.cert;
  certFile = path.join(dir, 'cert.pem');
  keyFile = path.join(dir, 'key.pem');
  fs.writeFileSync(certFile, pems.cert);
  fs.writeFileSync(keyFile, pems.private);
});

afterAll(() => {
  env.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

function get(port: number, pathname: string): Promise<{ status: number; body: string; peerCert: string }> {
  return new Promise((resolve, reject) => {
    const req = https.get({ host: '127.0.0.1', port, path: pathname, ca: certPem, servername: 'localhost' }, (res) => {
      const peer = res.socket && 'getPeerX509Certificate' in res.socket ? (res.socket as import('node:tls').TLSSocket).getPeerX509Certificate() : undefined;
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body, peerCert: peer?.fingerprint256 ?? '' }));
    });
    req.on('error', reject);
  });
}

test('with TLS_CERT_FILE and TLS_KEY_FILE the server answers over HTTPS with that certificate', async () => {
  const config = loadConfig({ WARMFOLD_MODE: 'demo', DATA_DIR: dir, PORT: '0', HOST: '127.0.0.1', TLS_CERT_FILE: certFile, TLS_KEY_FILE: keyFile });
  expect(config.tls).toEqual({ certFile, keyFile });
  const server = await new Promise<import('node:http').Server>((resolve) => {
    listen(env.app, config, (srv, scheme) => {
      expect(scheme).toBe('https');
      resolve(srv);
    });
  });
  try {
    const { port } = server.address() as AddressInfo;
    const res = await get(port, '/api/health');
    expect(res.status).toBe(200);
    // The certificate presented is the one in the file (compared by node:crypto, not by the server).
    expect(res.peerCert).toBe(new X509Certificate(certPem).fingerprint256);
    // A plain-HTTP request to the HTTPS port is not answered as HTTP (the socket speaks TLS).
    const plain = await fetch(`http://127.0.0.1:${port}/api/health`)
      .then((r) => r.status)
      .catch(() => 'refused');
    expect(plain).not.toBe(200);
  } finally {
    await new Promise((r) => server.close(r));
  }
});

test('without TLS settings the server speaks plain HTTP (localhost or behind a TLS proxy)', async () => {
  const config = loadConfig({ WARMFOLD_MODE: 'demo', DATA_DIR: dir, PORT: '0', HOST: '127.0.0.1' });
  expect(config.tls).toBeNull();
  const server = await new Promise<import('node:http').Server>((resolve) => listen(env.app, config, (srv, scheme) => (expect(scheme).toBe('http'), resolve(srv))));
  try {
    const { port } = server.address() as AddressInfo;
    expect((await fetch(`http://127.0.0.1:${port}/api/health`)).status).toBe(200);
  } finally {
    await new Promise((r) => server.close(r));
  }
});

test('a certificate without its key, or a file that is not there, is refused with the variable to fix', () => {
  const only = () => loadConfig({ WARMFOLD_MODE: 'demo', DATA_DIR: dir, TLS_CERT_FILE: certFile });
  expect(only).toThrow(ConfigError);
  expect(only).toThrow(/TLS_KEY_FILE/);
  expect(() => loadConfig({ WARMFOLD_MODE: 'demo', DATA_DIR: dir, TLS_CERT_FILE: certFile, TLS_KEY_FILE: path.join(dir, 'missing.pem') })).toThrow(/TLS_KEY_FILE: no file/);
});
