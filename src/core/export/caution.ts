/** Shown on the export screen next to the masking choices. */
export const EXPORT_PRIVACY_CAUTION =
  'Messages people type to a booking assistant often carry personal details: phone numbers, e-mail ' +
  'addresses, home addresses, names. Masking replaces every digit with 0 and every e-mail address with ' +
  'asterisks before the file is written, but it does not find names, street addresses or anything ' +
  'spelled out in words, so read a sample of the masked file before you share it. The export is built ' +
  'on this computer and nothing is sent anywhere; keep the files here, or somewhere just as private, ' +
  'unless you are sure they may leave.';
