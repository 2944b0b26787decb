/**
 * Webhook targets must not reach into the service's own network (server-side request forgery, OWASP SSRF
 * Prevention Cheat Sheet): loopback, private, link-local, shared, multicast and reserved addresses are refused unless
 * LEADLINE_WEBHOOK_ALLOW_PRIVATE is set. The check runs when an endpoint is created and again on every connection
 * (the resolved address is the one connected to), so a name that later resolves elsewhere is refused too.
 */
import { lookup as dnsLookup, type LookupAddress } from 'node:dns';
import { BlockList, isIP } from 'node:net';

// Special-purpose address registries (IANA IPv4 and IPv6 Special-Purpose Address Registries; RFC 6890)
const blocked = new BlockList();
for (const [net, bits] of [
  ['0.0.0.0', 8], ['10.0.0.0', 8], ['100.64.0.0', 10], ['127.0.0.0', 8], ['169.254.0.0', 16], ['172.16.0.0', 12],
  ['192.0.0.0', 24], ['192.0.2.0', 24], ['192.168.0.0', 16], ['198.18.0.0', 15], ['198.51.100.0', 24], ['203.0.113.0', 24],
  ['224.0.0.0', 4], ['240.0.0.0', 4],
] as const) blocked.addSubnet(net, bits, 'ipv4');
for (const [net, bits] of [
  ['::', 128], ['::1', 128], ['64:ff9b::', 96], ['100::', 64], ['2001:db8::', 32], ['fc00::', 7], ['fe80::', 10], ['ff00::', 8],
] as const) blocked.addSubnet(net, bits, 'ipv6');

/** True when the address is not a public unicast address. */
export function isPrivateAddress(address: string): boolean {
  const family = isIP(address);
  if (family === 4) return blocked.check(address, 'ipv4');
  if (family === 6) {
    const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(address);
    if (mapped) return blocked.check(mapped[1], 'ipv4');
    return blocked.check(address, 'ipv6');
  }
  return true;
}

export class RefusedAddress extends Error {}

/** Every address the host resolves to (the host itself when it is an address). */
export function resolveAll(host: string): Promise<LookupAddress[]> {
  const bare = host.replace(/^\[|\]$/g, '');
  const family = isIP(bare);
  if (family) return Promise.resolve([{ address: bare, family }]);
  return new Promise((resolve, reject) => dnsLookup(bare, { all: true }, (err, addresses) => (err ? reject(err) : resolve(addresses))));
}

/** Refuses (RefusedAddress) a host any of whose addresses is private, unless private addresses are allowed. */
export async function checkHost(host: string, allowPrivate: boolean): Promise<void> {
  const addresses = await resolveAll(host);
  if (!addresses.length) throw new RefusedAddress(`${host} has no address`);
  const bad = addresses.find((a) => isPrivateAddress(a.address));
  if (bad && !allowPrivate) throw new RefusedAddress(`${host} resolves to ${bad.address}, a loopback, private or reserved address`);
}

/**
 * A `lookup` for node:http(s) requests: resolves, refuses private answers (unless allowed) and connects to exactly
 * the checked address.
 */
export function guardedLookup(allowPrivate: boolean) {
  return (hostname: string, options: { all?: boolean } | number, callback: (...args: any[]) => void): void => {
    const all = typeof options === 'object' && options !== null && options.all === true;
    resolveAll(hostname).then(
      (addresses) => {
        const bad = addresses.find((a) => isPrivateAddress(a.address));
        if (!addresses.length) return callback(new RefusedAddress(`${hostname} has no address`));
        if (bad && !allowPrivate) return callback(new RefusedAddress(`${hostname} resolves to ${bad.address}, a loopback, private or reserved address`));
        if (all) callback(null, addresses);
        else callback(null, addresses[0].address, addresses[0].family);
      },
      (err) => callback(err),
    );
  };
}
