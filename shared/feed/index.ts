// Gillwise feeding rules: pure, isomorphic functions used by the server, the worker and the client.
// The rule, its defaults and its sources: docs/feeding.md.
export * from './rule';
export * from './ration';
export * from './stock';
export * from './levels';
