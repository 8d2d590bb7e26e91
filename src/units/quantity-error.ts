/** A value that cannot be read as the expected quantity; the message is one line, ready to show. */
export class QuantityError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'QuantityError';
  }
}
