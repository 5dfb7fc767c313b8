/**
 * The one error a malformed EDF/EDF+ byte string produces.
 *
 * `field` names the header field (or data-record part) at fault and `offset` is the byte offset in the
 * file where it starts, so that a lab engineer can open the file in a hex viewer and see the problem.
 */
export class EdfFormatError extends Error {
  readonly field: string;
  readonly offset: number;

  constructor(field: string, offset: number, message: string) {
    super(message);
    this.name = 'EdfFormatError';
    this.field = field;
    this.offset = offset;
  }
}
