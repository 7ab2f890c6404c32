// Local stand-in for a hosted e-mail provider: an SMTP server that accepts every message and a
// small HTTP API to read them back. The app sends to it through nodemailer exactly as it would to
// a real relay. Runs after `npm ci` (it needs smtp-server and mailparser).
//
//   node scripts/stack/smtp-fake.mjs [--smtp-port 2525] [--api-port 2526] [--store DIR] [--keep 500]
//
// HTTP API (127.0.0.1:<api-port>):
//   GET    /messages?to=<address>&limit=<n>   newest first: { messages: [...] } (no attachment bodies)
//   GET    /messages/:id                      one message, attachment bodies base64-encoded
//   DELETE /messages                          forget every message (tests)
//   GET    /health                            { ok: true }
import { randomUUID } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync, renameSync } from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export const DEFAULT_SMTP_PORT = 2525;
export const DEFAULT_MAIL_API_PORT = 2526;

const KEPT_HEADERS = new Set([
  'date',
  'message-id',
  'in-reply-to',
  'references',
  'reply-to',
  'list-unsubscribe',
  'list-unsubscribe-post',
  'auto-submitted',
  'precedence',
  'content-language',
]);
const MAX_INLINE_ATTACHMENT_BYTES = 2 * 1024 * 1024;

function headerSubset(headerLines) {
  const out = {};
  for (const { key, line } of headerLines ?? []) {
    if (!KEPT_HEADERS.has(key) && !key.startsWith('x-')) continue;
    const value = line.slice(line.indexOf(':') + 1).replace(/\r?\n[ \t]+/g, ' ').trim();
    out[key] = out[key] ? `${out[key]}, ${value}` : value;
  }
  return out;
}

function addresses(field) {
  if (!field) return [];
  const list = Array.isArray(field) ? field : [field];
  return list.flatMap((a) => a.value ?? []).map((v) => v.address?.toLowerCase()).filter(Boolean);
}

function formatAddress(a) {
  if (!a) return '';
  return a.name ? `${a.name} <${a.address ?? ''}>` : (a.address ?? '');
}

function summary(message) {
  return {
    ...message,
    attachments: message.attachments.map(({ contentBase64: _omit, ...meta }) => meta),
  };
}

/**
 * Start the fake. Port 0 picks a free port. Without `storeDir` messages are kept in memory only.
 * Resolves { smtpPort, apiPort, apiUrl, storeDir, close() }.
 */
export async function startSmtpFake({
  smtpPort = DEFAULT_SMTP_PORT,
  apiPort = DEFAULT_MAIL_API_PORT,
  storeDir,
  keep = 500,
  host = '127.0.0.1',
  onMessage,
} = {}) {
  /** newest last */
  const messages = [];
  if (storeDir) {
    mkdirSync(storeDir, { recursive: true });
    for (const file of readdirSync(storeDir).filter((f) => f.endsWith('.json')).sort()) {
      try {
        messages.push(JSON.parse(readFileSync(path.join(storeDir, file), 'utf8')));
      } catch {
        // a torn or foreign file: skip it
      }
    }
  }
  let sequence = messages.length;

  const fileOf = (m) => path.join(storeDir, `${m.file}.json`);

  function store(message) {
    messages.push(message);
    if (storeDir) {
      const tmp = `${fileOf(message)}.tmp`;
      writeFileSync(tmp, JSON.stringify(message, null, 2));
      renameSync(tmp, fileOf(message));
    }
    while (messages.length > keep) {
      const old = messages.shift();
      if (storeDir) rmSync(fileOf(old), { force: true });
    }
  }

  function clear() {
    const count = messages.length;
    for (const m of messages.splice(0)) if (storeDir) rmSync(fileOf(m), { force: true });
    return count;
  }

  const smtp = new SMTPServer({
    name: 'gillwise-smtp-fake',
    banner: 'Gillwise local mail catcher',
    disabledCommands: ['AUTH', 'STARTTLS'],
    authOptional: true,
    logger: false,
    size: 25 * 1024 * 1024,
    closeTimeout: 1000, // pooled senders keep connections open; do not hold shutdown for 30 s
    onData(stream, session, callback) {
      const chunks = [];
      stream.on('data', (c) => chunks.push(c));
      stream.on('error', callback);
      stream.on('end', async () => {
        if (stream.sizeExceeded) {
          const err = new Error('Message exceeds the 25 MB limit');
          err.responseCode = 552;
          callback(err);
          return;
        }
        try {
          const raw = Buffer.concat(chunks);
          const parsed = await simpleParser(raw);
          const receivedAt = new Date();
          const id = randomUUID();
          const message = {
            id,
            file: `${String(receivedAt.getTime()).padStart(14, '0')}-${String(++sequence).padStart(8, '0')}-${id}`,
            receivedAt: receivedAt.toISOString(),
            envelope: {
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            },
            from: formatAddress(parsed.from?.value?.[0]),
            fromAddress: parsed.from?.value?.[0]?.address?.toLowerCase() ?? '',
            // The envelope recipients: every address this message was delivered to (incl. Bcc).
            to: [...new Set(session.envelope.rcptTo.map((r) => r.address.toLowerCase()))],
            headerTo: addresses(parsed.to),
            cc: addresses(parsed.cc),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            headers: headerSubset(parsed.headerLines),
            attachments: (parsed.attachments ?? []).map((a) => ({
              filename: a.filename ?? null,
              contentType: a.contentType,
              size: a.size,
              contentBase64: a.size <= MAX_INLINE_ATTACHMENT_BYTES ? a.content.toString('base64') : null,
            })),
            sizeBytes: raw.length,
          };
          store(message);
          onMessage?.(message);
          callback(null, `Queued as ${id}`);
        } catch (err) {
          callback(err);
        }
      });
    },
  });

  const api = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://localhost');
    const send = (status, body) => {
      res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store' });
      res.end(JSON.stringify(body));
    };
    const parts = url.pathname.split('/').filter(Boolean);
    if (parts[0] === 'health' && parts.length === 1 && req.method === 'GET') return send(200, { ok: true });
    if (parts[0] !== 'messages' || parts.length > 2) return send(404, { error: { code: 'not_found', message: 'Not found' } });
    if (parts.length === 1 && req.method === 'GET') {
      const to = url.searchParams.get('to')?.toLowerCase();
      const limitParam = Number.parseInt(url.searchParams.get('limit') ?? '50', 10);
      const limit = Number.isFinite(limitParam) && limitParam > 0 ? Math.min(limitParam, 1000) : 50;
      const out = [];
      for (let i = messages.length - 1; i >= 0 && out.length < limit; i--) {
        const m = messages[i];
        if (to && !m.to.includes(to) && !m.headerTo.includes(to) && !m.cc.includes(to)) continue;
        out.push(summary(m));
      }
      return send(200, { messages: out });
    }
    if (parts.length === 1 && req.method === 'DELETE') return send(200, { deleted: clear() });
    if (parts.length === 2 && req.method === 'GET') {
      const m = messages.find((x) => x.id === parts[1]);
      return m ? send(200, m) : send(404, { error: { code: 'not_found', message: 'No such message' } });
    }
    res.setHeader('allow', parts.length === 1 ? 'GET, DELETE' : 'GET');
    return send(405, { error: { code: 'method_not_allowed', message: 'Method not allowed' } });
  });

  const listen = (server, port) =>
    new Promise((resolve, reject) => {
      server.once('error', reject);
      server.listen(port, host, () => {
        server.off('error', reject);
        resolve(server.address().port);
      });
    });

  smtp.on('error', () => {
    // a client misbehaving must not take the fake down; listen errors reject below
  });
  const actualSmtpPort = await listen(smtp.server, smtpPort);
  let actualApiPort;
  try {
    actualApiPort = await listen(api, apiPort);
  } catch (err) {
    await new Promise((r) => smtp.close(r));
    throw err;
  }
  let closed;
  return {
    smtpPort: actualSmtpPort,
    apiPort: actualApiPort,
    apiUrl: `http://${host}:${actualApiPort}`,
    storeDir,
    close() {
      closed ??= Promise.all([
        new Promise((r) => smtp.close(r)),
        new Promise((r) => {
          api.close(() => r());
          api.closeAllConnections();
        }),
      ]).then(() => undefined);
      return closed;
    },
  };
}

function parseArgs(argv) {
  const out = {};
  for (let i = 0; i < argv.length; i++) {
    const [key, inline] = argv[i].split('=', 2);
    const value = inline ?? argv[++i];
    if (key === '--smtp-port') out.smtpPort = Number(value);
    else if (key === '--api-port') out.apiPort = Number(value);
    else if (key === '--store') out.storeDir = path.resolve(value);
    else if (key === '--keep') out.keep = Number(value);
    else if (key === '--pidfile') out.pidFile = path.resolve(value);
    else throw new Error(`unknown option ${argv[i]}`);
  }
  return out;
}

const isMain = process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href;
if (isMain) {
  const { pidFile, ...options } = parseArgs(process.argv.slice(2));
  try {
    const fake = await startSmtpFake({
      ...options,
      onMessage: (m) => console.log(`received "${m.subject}" for ${m.to.join(', ')}`),
    });
    if (pidFile) writeFileSync(pidFile, `${process.pid}\n`);
    console.log(`SMTP on 127.0.0.1:${fake.smtpPort}, API on ${fake.apiUrl}${fake.storeDir ? `, store ${fake.storeDir}` : ''}`);
    process.send?.({ ready: true, smtpPort: fake.smtpPort, apiPort: fake.apiPort, apiUrl: fake.apiUrl });
    const stop = async () => {
      await fake.close();
      if (pidFile) rmSync(pidFile, { force: true });
      process.exit(0);
    };
    process.once('SIGTERM', stop);
    process.once('SIGINT', stop);
    // Started by scripts/start.mjs with an IPC channel: never outlive the parent.
    if (process.connected) process.once('disconnect', stop);
  } catch (err) {
    console.error(`smtp-fake: ${err.message}`);
    process.send?.({ ready: false, error: err.message });
    process.exit(1);
  }
}
