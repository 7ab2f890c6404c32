// A minimal MQTT 3.1.1 client for the load generator: CONNECT/SUBSCRIBE are encoded by mqtt-packet,
// PUBLISH and PUBACK by hand, so that the generator spends as little CPU as possible on the shared
// two cores and the figures describe the broker, not the client library.
import net from 'node:net';
import mqttPacket from 'mqtt-packet';

const { generate } = mqttPacket;

function varint(n) {
  const out = [];
  do {
    let byte = n % 128;
    n = Math.floor(n / 128);
    if (n > 0) byte |= 0x80;
    out.push(byte);
  } while (n > 0);
  return out;
}

/** A QoS 1 PUBLISH with the given packet id. topicBuf is the UTF-8 topic. */
export function publishPacket(topicBuf, id, payloadBuf) {
  const remaining = 2 + topicBuf.length + 2 + payloadBuf.length;
  const head = varint(remaining);
  const buf = Buffer.allocUnsafe(1 + head.length + remaining);
  let o = 0;
  buf[o++] = 0x32;
  for (const b of head) buf[o++] = b;
  buf.writeUInt16BE(topicBuf.length, o);
  o += 2;
  topicBuf.copy(buf, o);
  o += topicBuf.length;
  buf.writeUInt16BE(id, o);
  o += 2;
  payloadBuf.copy(buf, o);
  return buf;
}

const PUBACK = (id) => Buffer.from([0x40, 0x02, id >> 8, id & 0xff]);

/**
 * One connection. Calls onPuback(id) for each PUBACK, onPublish(topic, payload) for each delivered
 * PUBLISH (acknowledging QoS 1 deliveries itself), and onClose(err) once.
 */
export class WireClient {
  constructor({ host, port, clientId, username, password, keepalive = 120 }) {
    this.opts = { host, port, clientId, username, password, keepalive };
    this.buf = Buffer.alloc(0);
    this.onPuback = () => {};
    this.onPublish = null;
    this.onClose = () => {};
    this.closed = false;
  }

  connect(timeoutMs = 20_000) {
    return new Promise((resolve, reject) => {
      const { host, port, clientId, username, password, keepalive } = this.opts;
      const sock = net.connect({ host, port });
      this.sock = sock;
      sock.setNoDelay(true);
      const timer = setTimeout(() => {
        sock.destroy();
        reject(new Error(`CONNECT ${clientId}: no CONNACK in ${timeoutMs} ms`));
      }, timeoutMs);
      let connected = false;
      this.onConnack = (code) => {
        clearTimeout(timer);
        if (code !== 0) {
          sock.destroy();
          reject(new Error(`CONNECT ${clientId}: refused with code ${code}`));
        } else {
          connected = true;
          resolve();
        }
      };
      sock.on('connect', () => {
        const packet = { cmd: 'connect', protocolId: 'MQTT', protocolVersion: 4, clean: true, clientId, keepalive };
        if (username) packet.username = username;
        if (password) packet.password = Buffer.from(password);
        sock.write(generate(packet));
      });
      sock.on('data', (chunk) => this.#data(chunk));
      sock.on('error', (err) => {
        if (!connected) {
          clearTimeout(timer);
          reject(err);
        }
        this.lastError = err;
      });
      sock.on('close', () => {
        this.closed = true;
        this.onClose(this.lastError ?? null);
      });
    });
  }

  subscribe(topic, qos = 1) {
    return new Promise((resolve, reject) => {
      this.onSuback = (granted) => (granted[0] === 0x80 ? reject(new Error('subscription refused')) : resolve(granted));
      this.sock.write(generate({ cmd: 'subscribe', messageId: 1, subscriptions: [{ topic, qos }] }));
    });
  }

  write(buf) {
    return this.sock.write(buf);
  }

  end() {
    if (this.closed) return Promise.resolve();
    return new Promise((resolve) => {
      this.sock.once('close', resolve);
      this.sock.end(Buffer.from([0xe0, 0x00]));
      setTimeout(() => this.sock.destroy(), 2000).unref();
    });
  }

  #data(chunk) {
    let buf = this.buf.length ? Buffer.concat([this.buf, chunk]) : chunk;
    let o = 0;
    for (;;) {
      if (buf.length - o < 2) break;
      const type = buf[o] >> 4;
      let mult = 1;
      let len = 0;
      let i = o + 1;
      let complete = false;
      for (; i < buf.length && i < o + 5; i++) {
        len += (buf[i] & 0x7f) * mult;
        mult *= 128;
        if (!(buf[i] & 0x80)) {
          complete = true;
          i++;
          break;
        }
      }
      if (!complete || buf.length - i < len) break;
      const body = i;
      if (type === 4) this.onPuback(buf.readUInt16BE(body));
      else if (type === 2) this.onConnack?.(buf[body + 1]);
      else if (type === 9) this.onSuback?.([...buf.subarray(body + 2, body + len)]);
      else if (type === 3) {
        const qos = (buf[o] >> 1) & 3;
        const tlen = buf.readUInt16BE(body);
        const topic = buf.toString('utf8', body + 2, body + 2 + tlen);
        let p = body + 2 + tlen;
        if (qos > 0) {
          const id = buf.readUInt16BE(p);
          p += 2;
          this.sock.write(PUBACK(id));
        }
        this.onPublish?.(topic, buf.subarray(p, body + len));
      }
      o = body + len;
    }
    this.buf = o < buf.length ? Buffer.from(buf.subarray(o)) : Buffer.alloc(0);
  }
}
