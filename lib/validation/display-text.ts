/**
 * Names are shown to other people (member lists, reports, e-mails, the audit log). Control characters,
 * invisible formatting characters (zero-width spaces and joiners, the byte-order mark) and the
 * bidirectional overrides and isolates (U+202A-U+202E, U+2066-U+2069), which can make a name read
 * differently from what it is, are refused: Unicode general categories Cc, Cf, Zl and Zp.
 */
const HIDDEN = /[\p{Cc}\p{Cf}\p{Zl}\p{Zp}]/u;

export function hasNoHiddenCharacters(value: string): boolean {
  return !HIDDEN.test(value);
}

export const HIDDEN_CHARACTERS_MESSAGE = 'Remove the invisible, control or text-direction characters from the name.';
