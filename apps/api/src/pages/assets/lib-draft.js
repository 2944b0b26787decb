/*
 * Hand-over of a design between pages of one tab: a page puts a complete design input here and opens the design
 * form, which takes it (once) to fill its fields. sessionStorage, never a web address: the design stays in this tab.
 */
export const DRAFT_KEY = 'leadline.designDraft';

/** Stores a design input for the next design form of this tab; `origin` says where it came from, in words. */
export function putDraft(design, origin) {
  sessionStorage.setItem(DRAFT_KEY, JSON.stringify({ design: design, origin: String(origin || '') }));
}

/** The stored design input and its origin ({ design, origin }), removed as it is taken; null when there is none. */
export function takeDraft() {
  const text = sessionStorage.getItem(DRAFT_KEY);
  if (text === null) return null;
  sessionStorage.removeItem(DRAFT_KEY);
  try {
    const draft = JSON.parse(text);
    return draft && typeof draft === 'object' && draft.design && typeof draft.design === 'object' ? draft : null;
  } catch (e) {
    return null;
  }
}
