/*
 * What a user was last working on, kept in this browser for the pages that offer it again: the product last used
 * (localStorage: an id, never a credential) and the duty typed on the screw search (sessionStorage: this tab only),
 * so going to another page and back finds them as they were left.
 */
const PRODUCT_KEY = 'leadline.lastProduct';
const DUTY_KEY = 'leadline.sizingDuty';

function read(storage, key) {
  try {
    const text = storage.getItem(key);
    return text === null ? null : JSON.parse(text);
  } catch (e) {
    return null;
  }
}

/** Remembers the product a calculation was last opened in (or registered, or visited). */
export function rememberProduct(id) {
  if (id) localStorage.setItem(PRODUCT_KEY, JSON.stringify(String(id)));
}

/** The id of the product last used in this browser, or null. */
export function lastProduct() {
  const id = read(localStorage, PRODUCT_KEY);
  return typeof id === 'string' ? id : null;
}

/** Keeps the screw search's form state ({ controls, searched }) for this tab. */
export function saveDuty(state) {
  sessionStorage.setItem(DUTY_KEY, JSON.stringify(state));
}

/** The screw search's form state kept for this tab, or null. */
export function savedDuty() {
  const state = read(sessionStorage, DUTY_KEY);
  return state && typeof state === 'object' && state.controls && typeof state.controls === 'object' ? state : null;
}
