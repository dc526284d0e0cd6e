// Which browser origins may call the stand-in across origins: pages served from this machine
// (the admin and portal dev servers on their loopback ports). Loopback names as reserved by
// RFC 6761 §6.3 (localhost, *.localhost) and addresses by RFC 6890 (127.0.0.0/8) and RFC 4291 (::1).
// Pure: no framework imports.

export function isLoopbackOrigin(origin: string | undefined): origin is string {
  if (!origin) return false;
  let url: URL;
  try {
    url = new URL(origin);
  } catch {
    return false;
  }
  if (url.protocol !== 'http:' && url.protocol !== 'https:') return false;
  // An Origin header is exactly scheme://host[:port]; anything else is not one.
  if (url.origin !== origin) return false;
  const host = url.hostname;
  return host === 'localhost' || host.endsWith('.localhost') || host === '[::1]' || /^127(\.\d{1,3}){3}$/.test(host);
}
