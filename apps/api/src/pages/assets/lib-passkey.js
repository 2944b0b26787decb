/*
 * Passkeys in the browser (W3C Web Authentication Level 2): turns the service's JSON options into what
 * navigator.credentials.create/get take (base64url -> bytes), and the authenticator's answer back into JSON
 * (bytes -> base64url) for the service to check. No credential is kept by the page.
 */

function toBytes(text) {
  const b64 = text.replace(/-/g, '+').replace(/_/g, '/') + '==='.slice((text.length + 3) % 4);
  const raw = atob(b64);
  const out = new Uint8Array(raw.length);
  for (let i = 0; i < raw.length; i++) out[i] = raw.charCodeAt(i);
  return out.buffer;
}

function toText(buffer) {
  const bytes = new Uint8Array(buffer);
  let raw = '';
  for (let i = 0; i < bytes.length; i++) raw += String.fromCharCode(bytes[i]);
  return btoa(raw).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

/** Whether this browser and this page (a secure context) can use passkeys. */
export function passkeysAvailable() {
  return Boolean(window.isSecureContext && window.PublicKeyCredential && navigator.credentials);
}

/** A credential as the JSON the service reads (WebAuthn Level 3's PublicKeyCredentialJSON shape), with its response's fields. */
function asJson(credential, response) {
  return {
    id: credential.id,
    rawId: toText(credential.rawId),
    type: credential.type,
    response: response,
    clientExtensionResults: credential.getClientExtensionResults(),
    authenticatorAttachment: credential.authenticatorAttachment || undefined,
  };
}

function descriptors(list) {
  return (list || []).map(function (c) {
    return { id: toBytes(c.id), type: 'public-key', transports: c.transports };
  });
}

/** Makes a new passkey for the options of POST /api/v1/account/passkeys/options; answers its JSON. */
export async function createPasskey(options) {
  const credential = await navigator.credentials.create({
    publicKey: Object.assign({}, options, {
      challenge: toBytes(options.challenge),
      user: Object.assign({}, options.user, { id: toBytes(options.user.id) }),
      excludeCredentials: descriptors(options.excludeCredentials),
    }),
  });
  const r = credential.response;
  return asJson(credential, {
    clientDataJSON: toText(r.clientDataJSON),
    attestationObject: toText(r.attestationObject),
    transports: typeof r.getTransports === 'function' ? r.getTransports() : undefined,
  });
}

/** Signs a challenge with a passkey (sign-in, or signing a revision); answers the assertion as JSON. */
export async function usePasskey(options) {
  const credential = await navigator.credentials.get({
    publicKey: Object.assign({}, options, {
      challenge: toBytes(options.challenge),
      allowCredentials: descriptors(options.allowCredentials),
    }),
  });
  const r = credential.response;
  return asJson(credential, {
    clientDataJSON: toText(r.clientDataJSON),
    authenticatorData: toText(r.authenticatorData),
    signature: toText(r.signature),
    userHandle: r.userHandle ? toText(r.userHandle) : undefined,
  });
}
