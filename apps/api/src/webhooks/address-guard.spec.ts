import { checkHost, isPrivateAddress } from './address-guard';

// Ranges: IANA IPv4 and IPv6 Special-Purpose Address Registries (RFC 6890, RFC 1918, RFC 4193, RFC 4291)
describe('webhook address guard', () => {
  it.each(['127.0.0.1', '10.1.2.3', '172.16.0.1', '172.31.255.255', '192.168.1.1', '169.254.169.254', '100.64.0.1', '0.0.0.0', '224.0.0.1', '::1', '::', 'fd00::1', 'fe80::1', '::ffff:127.0.0.1', '::ffff:10.0.0.1'])(
    'refuses %s',
    (a) => expect(isPrivateAddress(a)).toBe(true),
  );

  it.each(['93.184.215.14', '172.32.0.1', '8.8.8.8', '2606:4700::1111', '::ffff:8.8.8.8'])('accepts the public address %s', (a) =>
    expect(isPrivateAddress(a)).toBe(false),
  );

  it('refuses a literal loopback host unless private addresses are allowed', async () => {
    await expect(checkHost('127.0.0.1', false)).rejects.toThrow(/loopback, private or reserved/);
    await expect(checkHost('[::1]', false)).rejects.toThrow(/loopback/);
    await expect(checkHost('127.0.0.1', true)).resolves.toBeUndefined();
  });
});
