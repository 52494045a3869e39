// The add-in's origin: where dist/ is served from. Source files (manifest.xml, the help links in
// src/functions/registry.ts and the @helpurl tags of src/functions/functions.ts) use the dev
// origin https://localhost:3000; a build for a team sets its own origin once,
//   npm run build -- --env origin=https://addins.example.org
// or with the environment variable RATCHET_ORIGIN, and webpack.config.js then writes that origin
// into every emitted manifest.xml, functions.json and script (see substituteOrigin below).

/** The origin of `npm run dev-server`, used by the source files. */
export const DEV_ORIGIN = 'https://localhost:3000';

/** The dev origin as it appears in text, not followed by another digit of a longer port. */
const DEV_ORIGIN_PATTERN = /https:\/\/localhost:3000(?![0-9])/g;

/**
 * Checks an origin for a deployment and returns it in canonical form (lower-case host, no
 * trailing slash, default port dropped): https only (Office loads add-ins only over https), a
 * host, an optional port, nothing else — no path, query, fragment, user or password. O(length).
 * @param text e.g. "https://addins.example.org" or "https://intranet.example.org:8443/".
 * @throws Error naming the setting and what it needs.
 * @example checkOrigin('https://Addins.Example.org/') // → 'https://addins.example.org'
 */
export function checkOrigin(text) {
  const what = `origin: needs an https address such as https://addins.example.org (host and optional port only)`;
  let url;
  try {
    url = new URL(String(text).trim());
  } catch {
    throw new Error(`${what}; got ${JSON.stringify(text)}.`);
  }
  if (url.protocol !== 'https:') throw new Error(`${what}; got ${JSON.stringify(text)}, which is not https (Office loads add-ins only over https).`);
  if (url.username || url.password || url.search || url.hash || (url.pathname !== '/' && url.pathname !== '')) {
    throw new Error(`${what}; got ${JSON.stringify(text)}, which has more than a host and port (serve dist/ at the root of its host).`);
  }
  return url.origin;
}

/**
 * Replaces the dev origin in `text` by `origin` (checked by {@link checkOrigin}). O(length).
 * @example substituteOrigin('<IconUrl DefaultValue="https://localhost:3000/assets/icon-32.png"/>', 'https://addins.example.org')
 * // → '<IconUrl DefaultValue="https://addins.example.org/assets/icon-32.png"/>'
 */
export function substituteOrigin(text, origin) {
  const o = checkOrigin(origin);
  return text.replace(DEV_ORIGIN_PATTERN, o);
}

/**
 * The deployment origin a build was asked for: webpack's `--env origin=…` first, then the
 * environment variable RATCHET_ORIGIN; undefined when neither is set (a dev build). O(1).
 * @param env webpack's env object (may be undefined). @param vars process.env.
 * @throws Error from {@link checkOrigin} for a malformed origin.
 * @example originSetting({ origin: 'https://addins.example.org' }, {}) // → 'https://addins.example.org'
 */
export function originSetting(env, vars) {
  const raw = (env && typeof env.origin === 'string' && env.origin) || (vars && vars.RATCHET_ORIGIN) || undefined;
  return raw === undefined || raw === '' ? undefined : checkOrigin(raw);
}

/** Emitted files whose text carries the origin: the manifest, the functions' metadata, scripts. */
export const ORIGIN_ASSETS = /(^|\/)(manifest\.xml|functions\.json|[^/]+\.js)$/;

/** Files that must contain the dev origin before substitution (a build that misses them is refused). */
export const REQUIRED_ORIGIN_ASSETS = ['manifest.xml', 'functions.json'];
