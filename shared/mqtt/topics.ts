// Gillwise MQTT topic scheme, version 1 (docs/mqtt.md):
//   gillwise/v1/probes/<probeKey>/readings   probe → server, JSON readings payload
// The probeKey is also the MQTT username; a probe may publish only under its own key.
export const TOPIC_ROOT = 'gillwise';
export const TOPIC_VERSION = 'v1';

const PROBE_KEY = /^[a-z0-9][a-z0-9-]{1,62}$/;

export function isValidProbeKey(probeKey: string): boolean {
  return PROBE_KEY.test(probeKey);
}

export function readingsTopic(probeKey: string): string {
  if (!isValidProbeKey(probeKey)) throw new Error(`invalid probe key: ${probeKey}`);
  return `${TOPIC_ROOT}/${TOPIC_VERSION}/probes/${probeKey}/readings`;
}

export type ParsedTopic = { kind: 'readings'; version: 'v1'; probeKey: string };

export function parseTopic(topic: string): ParsedTopic | null {
  const parts = topic.split('/');
  if (parts.length !== 5) return null;
  const [root, version, probes, probeKey, leaf] = parts;
  if (root !== TOPIC_ROOT || version !== TOPIC_VERSION || probes !== 'probes' || leaf !== 'readings') return null;
  if (!probeKey || !isValidProbeKey(probeKey)) return null;
  return { kind: 'readings', version: 'v1', probeKey };
}
